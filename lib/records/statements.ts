import { formatDay } from "@/lib/time";

// The statements a signer certifies (pure, shown on the form and stored with the signed record).
// A stage check is signed like a sign-off: the examiner reads the statement and re-enters the password.

export function stageCheckStatement(p: {
  examinerName: string;
  studentName: string;
  stageCode: string;
  stageTitle: string;
  occurredOn: string;
}): string {
  return (
    `I, ${p.examinerName}, certify that I examined ${p.studentName} in the stage check of stage ${p.stageCode} "${p.stageTitle}" ` +
    `on ${formatDay(p.occurredOn)}, that I am not the lead instructor of this student unless a reason to examine anyway is recorded with the check, ` +
    `and that the result, the oral outcomes and the written score recorded here are those the student showed.`
  );
}
