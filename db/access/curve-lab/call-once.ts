import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CallMarkerKind } from "../../models";

// Call it first, once: one call per student per demo revision (unique index demo_calls_one_per_revision).
// A second call returns the first one unchanged, so a reload or a second tab shows the result, never a new prompt.

export interface StoredCall {
  id: string;
  predictedMs: number;
  actualMs: number;
  errorMs: number;
  createdAt: string;
  /** true when this student had already called this revision: nothing new was stored */
  alreadyMade: boolean;
}

interface Row {
  id: string;
  predictedMs: number;
  actualMs: number;
  errorMs: number;
  createdAt: Date;
}

const COLUMNS = `id, predicted_ms AS "predictedMs", actual_ms AS "actualMs", error_ms AS "errorMs", created_at AS "createdAt"`;

export async function recordCallOnce(
  input: {
    schoolId: string;
    demoRevisionId: string;
    studentId: string;
    markerKind: CallMarkerKind;
    speedAxis: "equivalent" | "true";
    predictedMs: number;
    actualMs: number;
  },
  t: Transaction,
): Promise<StoredCall> {
  const inserted = await sequelize.query<Row>(
    `INSERT INTO demo_calls (school_id, demo_revision_id, student_id, marker_kind, speed_axis, predicted_ms, actual_ms, error_ms)
     VALUES (:schoolId, :demoRevisionId, :studentId, :markerKind, :speedAxis, :predictedMs, :actualMs, :errorMs)
     ON CONFLICT (demo_revision_id, student_id) DO NOTHING
     RETURNING ${COLUMNS}`,
    { replacements: { ...input, errorMs: input.predictedMs - input.actualMs }, type: QueryTypes.SELECT, transaction: t },
  );
  let row = inserted[0];
  const alreadyMade = !row;
  if (!row) {
    [row] = await sequelize.query<Row>(
      `SELECT ${COLUMNS} FROM demo_calls WHERE demo_revision_id = :demoRevisionId AND student_id = :studentId AND school_id = :schoolId`,
      { replacements: input, type: QueryTypes.SELECT, transaction: t },
    );
  }
  if (!row) throw new Error("demo call vanished");
  return { ...row, createdAt: new Date(row.createdAt).toISOString(), alreadyMade };
}

/** The student's own call on one demo revision, or null: what the page shows after a reload. */
export async function ownCallOnRevision(schoolId: string, demoRevisionId: string, studentId: string): Promise<StoredCall | null> {
  const [row] = await sequelize.query<Row>(
    `SELECT ${COLUMNS} FROM demo_calls WHERE demo_revision_id = :demoRevisionId AND student_id = :studentId AND school_id = :schoolId`,
    { replacements: { schoolId, demoRevisionId, studentId }, type: QueryTypes.SELECT },
  );
  return row ? { ...row, createdAt: new Date(row.createdAt).toISOString(), alreadyMade: true } : null;
}
