import "server-only";
import { differenceInCalendarDays } from "date-fns";
import type { CurrentUser } from "@/lib/auth/session";
import { now } from "@/lib/clock";
import { activeEnrolment } from "../shared/enrolment";
import { recordStudentsFor } from "./student-list";
import { stageReadiness } from "./stage-readiness";
import { signOffRegister } from "./sign-off-register";
import { verifyChain } from "./audit-chain";

/** The chief's Today: stage checks waiting (and since when), watch notes, the chain's status. */
export async function chiefRecordsSummary(user: CurrentUser) {
  const students = await recordStudentsFor(user);
  const waiting: { studentId: string; studentName: string; stageCode: string; since: Date | null; days: number | null }[] = [];
  for (const st of students) {
    const student = await activeEnrolment(user.schoolId, st.id);
    if (!student) continue;
    for (const s of await stageReadiness(student)) {
      if (s.ready)
        waiting.push({
          studentId: st.id,
          studentName: st.name,
          stageCode: s.code,
          since: s.readySince,
          days: s.readySince ? differenceInCalendarDays(now(), s.readySince) : null,
        });
    }
  }
  waiting.sort((a, b) => (b.days ?? 0) - (a.days ?? 0));
  const { notes } = await signOffRegister(user);
  const chain = await verifyChain(user.schoolId);
  return { waiting, notes, chain };
}
