import type { EndKind } from "./schema";

// The words of the end of training: the chief instructor's certification statement (14 CFR
// 141.101(c)) proposed on the form, and the graduation certificate's completion statement (141.95(b)).

export const END_KIND_WORDS: Record<EndKind, string> = {
  graduated: "Graduated",
  terminated: "Training ended by the school",
  transferred: "Transferred to another school",
};

export const CERTIFICATION_PURPOSE: Record<EndKind, "graduation" | "termination" | "transfer_out"> = {
  graduated: "graduation",
  terminated: "termination",
  transferred: "transfer_out",
};

/** The certification statement the form proposes; the chief may reword it before signing. */
export function proposedStatement(p: {
  kind: EndKind;
  certifierName: string;
  studentName: string;
  schoolName: string;
  courseTitle: string;
}): string {
  const base = `I, ${p.certifierName}, chief instructor of ${p.schoolName}, certify that the training record of ${p.studentName} in ${p.courseTitle} is true and complete as kept by the school`;
  if (p.kind === "graduated") return `${base}, and that ${p.studentName} completed every stage of the course and its tests and graduated.`;
  if (p.kind === "transferred") return `${base} on the day the student transferred to another school.`;
  return `${base} on the day training ended.`;
}

/** The completion statement printed on every graduation certificate. */
export function completionStatement(studentName: string, courseTitle: string): string {
  return `${studentName} has satisfactorily completed every stage of the ${courseTitle} course, including each stage check and end-of-course test, as shown in the training record kept by the school.`;
}
