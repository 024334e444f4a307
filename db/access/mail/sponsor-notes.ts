import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { HttpError } from "@/lib/http/errors";
import { studentScopeSql, type Caller } from "../shared/student-scope";

// Notes for a student's sponsors, carried by the next Weekly letter.

export interface NoteStudent {
  id: string;
  name: string;
  sponsors: number;
}

/**
 * Students the caller may write a sponsor note for: the students whose records they keep (the
 * one scoping rule, purpose "records": the chief every student, an instructor those they teach)
 * who have a sponsor.
 */
export async function studentsForNotes(user: Caller, t?: Transaction, only?: string): Promise<NoteStudent[]> {
  const scope = studentScopeSql(user, "records", "p.id");
  return sequelize.query<NoteStudent>(
    `SELECT p.id, p.name, count(l.id)::int AS sponsors FROM people p JOIN sponsor_links l ON l.student_id = p.id
      WHERE p.school_id = :s AND p.active AND ${scope.sql} ${only ? "AND p.id = CAST(:only AS uuid)" : ""}
      GROUP BY p.id, p.name ORDER BY p.name`,
    { replacements: { s: user.schoolId, only: only ?? null, ...scope.replacements }, type: QueryTypes.SELECT, transaction: t },
  );
}

export interface NoteRow {
  id: string;
  studentName: string;
  authorName: string;
  body: string;
  createdAt: Date;
}

/** The latest notes about the students whose records the caller keeps (same rule as studentsForNotes). */
export async function recentNotes(user: Caller, limit = 30): Promise<NoteRow[]> {
  const scope = studentScopeSql(user, "records", "n.student_id");
  return sequelize.query<NoteRow>(
    `SELECT n.id, st.name AS "studentName", a.name AS "authorName", n.body, n.created_at AS "createdAt"
       FROM sponsor_notes n JOIN people st ON st.id = n.student_id JOIN people a ON a.id = n.author_id
      WHERE n.school_id = :s AND ${scope.sql}
      ORDER BY n.created_at DESC LIMIT :limit`,
    { replacements: { s: user.schoolId, limit, ...scope.replacements }, type: QueryTypes.SELECT },
  );
}

export async function addSponsorNote(user: Caller, input: { studentId: string; body: string }, t: Transaction) {
  // this one student, not every student the caller may write about
  const allowed = await studentsForNotes(user, t, input.studentId);
  if (!allowed.some((s) => s.id === input.studentId)) {
    throw new HttpError(404, "studentId: not a student you teach who has a sponsor", "studentId");
  }
  const [row] = await sequelize.query<{ id: string }>(
    `INSERT INTO sponsor_notes (school_id, student_id, author_id, body) VALUES (:s, :st, :a, :b) RETURNING id`,
    { replacements: { s: user.schoolId, st: input.studentId, a: user.id, b: input.body.trim() }, type: QueryTypes.SELECT, transaction: t },
  );
  return { id: row!.id };
}
