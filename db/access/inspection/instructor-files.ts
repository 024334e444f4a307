import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { InstructorFile } from "@/lib/inspection/content";
import { recencyDue, isCurrentOn } from "@/lib/inspection/recency";
import { qualificationHistory } from "../people/qualification-reads";

// The instructor files of the inspection pack: for each person who taught, checked or signed for
// the inspected student, every version of their qualifications (the history kept by
// people/qualification-history.ts), their course grants, recency as of today and the briefings
// they have taught at the school (sessions held, not cancelled, up to now).

export async function instructorFiles(
  school: { id: string; timeZone: string },
  involved: { personId: string; parts: string[] }[],
  today: string,
  madeAt: Date,
): Promise<InstructorFile[]> {
  if (involved.length === 0) return [];
  const ids = involved.map((i) => i.personId);
  const names = new Map(
    (
      await sequelize.query<{ id: string; name: string }>(`SELECT id, name FROM people WHERE school_id = :school AND id IN (:ids)`, {
        replacements: { school: school.id, ids },
        type: QueryTypes.SELECT,
      })
    ).map((p) => [p.id, p.name]),
  );
  const taught = await sequelize.query<{ personId: string; title: string; sessions: number; firstOn: string; lastOn: string }>(
    `SELECT s.instructor_id AS "personId", br.title, count(*)::int AS sessions,
            min((s.starts_at AT TIME ZONE :tz)::date)::text AS "firstOn", max((s.starts_at AT TIME ZONE :tz)::date)::text AS "lastOn"
       FROM training_sessions s JOIN briefing_revisions br ON br.id = s.briefing_revision_id
      WHERE s.school_id = :school AND s.instructor_id IN (:ids) AND s.status = 'scheduled' AND s.starts_at <= :madeAt
      GROUP BY s.instructor_id, br.title ORDER BY br.title`,
    { replacements: { school: school.id, ids, tz: school.timeZone, madeAt }, type: QueryTypes.SELECT },
  );
  const files: InstructorFile[] = [];
  for (const person of involved) {
    const name = names.get(person.personId);
    if (!name) continue;
    const { versions, courses } = await qualificationHistory(school.id, person.personId);
    files.push({
      name,
      parts: person.parts,
      versions: versions.map((v) => ({
        version: v.version,
        certificateKind: v.certificateKind,
        certificateNumber: v.certificateNumber,
        ratings: v.ratings,
        checkInstructor: v.checkInstructor,
        issuedOn: v.issuedOn,
        recencyOn: v.recencyOn,
        recencyMonths: v.recencyMonths,
        validFrom: v.validFrom,
        validTo: v.validTo,
        changeNote: v.changeNote,
        recordedByName: v.recordedByName,
      })),
      courses: courses.map((c) => ({ code: c.code, validFrom: c.validFrom, validTo: c.validTo })),
      recency: versions
        .filter((v) => v.validFrom <= today && (v.validTo === null || today < v.validTo))
        .map((v) => {
          const dueOn = recencyDue(v.recencyOn, v.recencyMonths);
          return { certificateNumber: v.certificateNumber, dueOn, current: isCurrentOn(today, dueOn) };
        }),
      briefingsTaught: taught
        .filter((t) => t.personId === person.personId)
        .map((t) => ({ title: t.title, sessions: t.sessions, firstOn: t.firstOn, lastOn: t.lastOn })),
    });
  }
  return files;
}
