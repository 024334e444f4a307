import { sequelize } from "@/db/index";
import {
  appendQualificationVersion,
  openVersions,
  qualificationFieldsOf,
  type QualificationFields,
} from "@/db/access/people/qualification-history";

/**
 * Records a change to a person's (first) qualification in force from `effectiveFrom`, the way the
 * chief's form does: the open version is closed on that date and the next one appended.
 */
export async function changeQualification(personId: string, changes: Partial<QualificationFields>, effectiveFrom: string) {
  return sequelize.transaction(async (t) => {
    const [open] = await openVersions(personId, t);
    if (!open) throw new Error(`no open qualification for ${personId}`);
    return appendQualificationVersion(t, {
      personId,
      open,
      fields: { ...qualificationFieldsOf(open), ...changes },
      effectiveFrom,
      recordedBy: personId,
      changeNote: "changed by a test",
    });
  });
}

/** Ends every course grant of a person from `onDate` (grants are closed, never deleted). */
export async function endCourseGrants(personId: string, onDate: string) {
  await sequelize.query(
    `UPDATE instructor_courses SET valid_to = GREATEST(valid_from, CAST(:d AS date)) WHERE person_id = :p AND valid_to IS NULL`,
    {
      replacements: { p: personId, d: onDate },
    },
  );
}
