import "server-only";
import type { PackInput } from "@/lib/inspection/content";
import { dateInZone } from "@/lib/time";
import { transferCreditsOf } from "../transfers/credits";
import { retentionOf } from "../retention/records";

// The inspected student's transfer-in credit on their course and the retention of their record,
// read through the transfers and retention areas' contracts (DEVELOPERS.md). The caller has
// already been given the student (inspectedStudent).

export async function creditAndRetention(
  school: { id: string; timeZone: string },
  student: { id: string; courseId: string },
): Promise<Pick<PackInput, "transferCredits" | "retention">> {
  const day = (d: Date) => dateInZone(d, school.timeZone);
  const credits = await transferCreditsOf(student.id, student.courseId);
  const r = await retentionOf(school.id, student.id);
  return {
    transferCredits: credits.map((c) => ({
      sourceSchool: c.sourceSchool,
      sourceApproved: c.sourceApproved,
      creditedMinutes: c.creditedMinutes,
      capMinutes: c.capMinutes,
      testKind: c.testKind,
      testTakenOn: c.testTakenOn,
      testResult: c.testResult,
      itemCodes: c.items.map((i) => i.code),
      evidenceFileName: c.evidenceFileName,
      evidenceSha256: c.evidenceSha256,
      recordedByName: c.recordedByName,
      recordedOn: day(c.createdAt),
      auditHash: c.auditHash,
    })),
    retention: r && {
      endedOn: r.endedOn,
      keepUntil: r.keepUntil,
      governing: r.governing,
      state: r.state,
      hold: r.hold && { reason: r.hold.reason, setOn: day(r.hold.setAt), setByName: r.hold.setByName },
      archived: r.archived && { on: day(r.archived.on), byName: r.archived.byName },
    },
  };
}
