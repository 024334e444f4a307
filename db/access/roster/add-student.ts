import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { createPerson } from "../people/create-person";
import { getSchool } from "../shared/school";
import { queueInvitation } from "../people/invite-person";
import { addToCohort } from "../cohorts/memberships";
import { enrol } from "../cohorts/enrol";
import { linkSponsor } from "../cohorts/sponsor-links";
import { cohortsManagedBy } from "./managed-cohorts";
import { dateInZone } from "@/lib/time";
import { now } from "@/lib/clock";
import { HttpError } from "@/lib/http/errors";
import type { CurrentUser } from "@/lib/auth/session";
import type { AddStudentInput } from "@/lib/roster/schema";

/**
 * Adds one student: the account (no password; an invitation to set one goes through the outbox),
 * membership of the cohort from today, enrolment on the cohort's course at its latest syllabus
 * revision, and optionally a sponsor (an existing sponsor account is linked, a new one is invited).
 */
export async function addStudentTx(
  user: CurrentUser,
  input: AddStudentInput,
  t: Transaction,
): Promise<{ studentId: string; sponsorId: string | null; invitations: number }> {
  const cohort = (await cohortsManagedBy(user, t)).find((c) => c.id === input.cohortId);
  if (!cohort) throw new HttpError(404, "cohortId: no such cohort that you may add to", "cohortId");
  const school = await getSchool(user.schoolId, t);
  const today = dateInZone(now(), school.timeZone);
  // createPerson checks first; the unique index on lower(email) catches a writer that slipped in between
  const taken = (e: unknown, field: "email" | "sponsorEmail") => {
    const code = (e as { parent?: { code?: string } })?.parent?.code;
    if (e instanceof HttpError || code === "23505")
      throw new HttpError(409, `${field === "email" ? "e-mail" : "sponsor e-mail"}: already belongs to an account`, field);
    throw e;
  };
  const student = await createPerson({ schoolId: user.schoolId, name: input.name, email: input.email, roles: ["student"] }, t).catch((e) =>
    taken(e, "email"),
  );
  await addToCohort({ cohortId: cohort.id, studentId: student.id, fromDate: today }, t);
  const [rev] = await sequelize.query<{ id: string }>(
    `SELECT id FROM syllabus_revisions WHERE course_id = :c ORDER BY number DESC LIMIT 1`,
    { replacements: { c: cohort.courseId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (rev) await enrol({ studentId: student.id, courseId: cohort.courseId, revisionId: rev.id, enrolledOn: today }, t);
  let invitations = 0;
  await queueInvitation(t, { schoolId: user.schoolId, personId: student.id, name: student.name, email: student.email });
  invitations++;
  let sponsorId: string | null = null;
  if (input.sponsorEmail) {
    const [found] = await sequelize.query<{ id: string; schoolId: string; isSponsor: boolean }>(
      `SELECT id, school_id AS "schoolId", 'sponsor' = ANY(roles) AS "isSponsor" FROM people WHERE lower(email) = :e`,
      { replacements: { e: input.sponsorEmail.toLowerCase() }, type: QueryTypes.SELECT, transaction: t },
    );
    if (found) {
      if (found.schoolId !== user.schoolId || !found.isSponsor) {
        throw new HttpError(409, "sponsor e-mail: belongs to an account that is not a sponsor of this school", "sponsorEmail");
      }
      sponsorId = found.id;
    } else {
      const sponsor = await createPerson(
        { schoolId: user.schoolId, name: input.sponsorName || input.sponsorEmail, email: input.sponsorEmail, roles: ["sponsor"] },
        t,
      ).catch((e) => taken(e, "sponsorEmail"));
      sponsorId = sponsor.id;
      await queueInvitation(t, { schoolId: user.schoolId, personId: sponsor.id, name: sponsor.name, email: sponsor.email });
      invitations++;
    }
    await linkSponsor({ sponsorId, studentId: student.id }, t);
  }
  return { studentId: student.id, sponsorId, invitations };
}
