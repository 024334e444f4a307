import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CallMarkerKind } from "../../models";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";
import type { DemoSpec } from "@/lib/curve-lab/demo-spec";
import { callAnswerFlag } from "@/lib/curve-lab/readouts";

// Call it first: the calls made on a demo, as the caller may see them (storing a call: call-once.ts).

export interface CallRow {
  id: string;
  studentId: string;
  studentName: string;
  revisionNumber: number;
  markerKind: CallMarkerKind;
  speedAxis: "equivalent" | "true";
  predictedMs: number;
  actualMs: number;
  errorMs: number;
  createdAt: string;
  /** lib/aero's validity words of the answer on its revision's spec ("" when valid), shown beside it */
  answerFlag: string;
}

/**
 * Calls made on a demo (any of its revisions), scoped to the viewer: one who may see every student sees
 * all; an instructor sees the calls of students in the cohorts they lead; a student their own.
 */
export async function listCallsForDemo(viewer: CurrentUser, demoId: string): Promise<CallRow[]> {
  const chief = can(viewer, "students.all");
  const instructor = can(viewer, "students.taught");
  const rows = await sequelize.query<Omit<CallRow, "createdAt" | "answerFlag"> & { createdAt: Date; spec: DemoSpec }>(
    `SELECT c.id, c.student_id AS "studentId", p.name AS "studentName", r.number AS "revisionNumber", c.marker_kind AS "markerKind", r.spec,
            c.speed_axis AS "speedAxis", c.predicted_ms AS "predictedMs", c.actual_ms AS "actualMs", c.error_ms AS "errorMs", c.created_at AS "createdAt"
       FROM demo_calls c JOIN demo_revisions r ON r.id = c.demo_revision_id JOIN demos d ON d.id = r.demo_id JOIN people p ON p.id = c.student_id
      WHERE d.id = :demoId AND d.school_id = :schoolId AND c.school_id = :schoolId
        AND (:chief OR c.student_id = :viewerId OR (:instructor AND EXISTS (
              SELECT 1 FROM cohort_memberships m JOIN cohorts co ON co.id = m.cohort_id
               WHERE m.student_id = c.student_id AND m.to_date IS NULL AND co.lead_instructor_id = :viewerId)))
      ORDER BY c.created_at DESC`,
    { replacements: { demoId, schoolId: viewer.schoolId, chief, instructor, viewerId: viewer.id }, type: QueryTypes.SELECT },
  );
  return rows.map(({ spec, ...r }) => ({
    ...r,
    createdAt: new Date(r.createdAt).toISOString(),
    answerFlag: callAnswerFlag(spec, r.markerKind),
  }));
}
