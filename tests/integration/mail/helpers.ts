import { spawn, type ChildProcess } from "node:child_process";
import { mkdtempSync, readFileSync } from "node:fs";
import net from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { randomUUID } from "node:crypto";
import { QueryTypes } from "sequelize";
import { simpleParser, type ParsedMail } from "mailparser";
import { sequelize } from "@/db/index";
import { startSink, type RunningSink } from "@/lib/mail/sink-server";

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.once("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const a = srv.address();
      srv.close(() => (a && typeof a === "object" ? resolve(a.port) : reject(new Error("no port"))));
    });
  });
}

/** A real SMTP server on loopback for one test, storing into its own temp folder. */
export async function testSink(port = 0): Promise<RunningSink & { dir: string }> {
  const dir = mkdtempSync(path.join(tmpdir(), "chalkwing-sink-"));
  const s = await startSink({ dir, port });
  return { ...s, dir };
}

export async function parseStored(sink: { dir: string }, file: string): Promise<ParsedMail> {
  return simpleParser(readFileSync(path.join(sink.dir, file)));
}

/** Polls `check` every 100 ms until it returns a truthy value or `ms` passes (then throws with `what`). */
export async function waitFor<T>(what: string, check: () => Promise<T | null | undefined | false>, ms = 40_000): Promise<T> {
  const until = Date.now() + ms;
  for (;;) {
    const v = await check();
    if (v) return v;
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

export interface WorkerProcess {
  child: ChildProcess;
  output: () => string;
  exited: Promise<{ code: number | null; signal: NodeJS.Signals | null }>;
  stop: () => Promise<void>;
}

/** The real worker (`lib/mail/worker.ts`) as a child process, with fast test timings. */
export function spawnWorker(smtpPort: number, extraEnv: Record<string, string> = {}): WorkerProcess {
  let out = "";
  const child = spawn(process.execPath, [path.join(process.cwd(), "node_modules/tsx/dist/cli.mjs"), "lib/mail/worker.ts"], {
    cwd: process.cwd(),
    env: {
      ...process.env,
      NODE_OPTIONS: "--conditions=react-server",
      SMTP_HOST: "127.0.0.1",
      SMTP_PORT: String(smtpPort),
      CHALKWING_MAIL_TICK_SECONDS: "0.5",
      CHALKWING_MAIL_RETRY_DELAY: "1",
      CHALKWING_MAIL_RETRY_LIMIT: "10",
      CHALKWING_MAIL_JOB_EXPIRE_SECONDS: "2",
      CHALKWING_MAIL_MAINTENANCE_SECONDS: "1",
      CHALKWING_MAIL_PRODUCERS: "off",
      ...extraEnv,
    },
    stdio: ["ignore", "pipe", "pipe"],
  });
  child.stdout?.on("data", (d: Buffer) => (out += d.toString()));
  child.stderr?.on("data", (d: Buffer) => (out += d.toString()));
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) =>
    child.once("exit", (code, signal) => resolve({ code, signal })),
  );
  return {
    child,
    output: () => out,
    exited,
    stop: async () => {
      if (child.exitCode === null && child.signalCode === null) {
        child.kill("SIGTERM");
        const t = setTimeout(() => child.kill("SIGKILL"), 8000);
        await exited;
        clearTimeout(t);
      }
    },
  };
}

export async function outboxRow(key: string) {
  const [row] = await sequelize.query<{
    id: string;
    state: string;
    attempts: number;
    last_error: string | null;
    message_id: string;
    sent_at: Date | null;
  }>(`SELECT id, state, attempts, last_error, message_id, sent_at FROM outbox WHERE idempotency_key = :key`, {
    replacements: { key },
    type: QueryTypes.SELECT,
  });
  return row ?? null;
}

export async function deliveriesOf(outboxId: string): Promise<number> {
  const [row] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM mail_deliveries WHERE outbox_id = :id`, {
    replacements: { id: outboxId },
    type: QueryTypes.SELECT,
  });
  return row?.n ?? 0;
}

/** A briefing with one revision, written straight into the briefings area's tables (contract names). */
export async function makeBriefing(
  s: { school: { id: string }; course: { id: string }; revision: { id: string }; people: { instructor: { id: string } } },
  title: string,
) {
  return sequelize.transaction(async (t) => {
    const [b] = await sequelize.query<{ id: string }>(
      `INSERT INTO briefings (school_id, course_id, owner_id) VALUES (:s, :c, :o) RETURNING id`,
      { replacements: { s: s.school.id, c: s.course.id, o: s.people.instructor.id }, type: QueryTypes.SELECT, transaction: t },
    );
    const [r] = await sequelize.query<{ id: string }>(
      `INSERT INTO briefing_revisions (briefing_id, number, title, objective, completion_standard, syllabus_revision_id, created_by)
       VALUES (:b, 1, :title, 'Objective', 'Standard', :rev, :o) RETURNING id`,
      { replacements: { b: b!.id, title, rev: s.revision.id, o: s.people.instructor.id }, type: QueryTypes.SELECT, transaction: t },
    );
    await sequelize.query(`UPDATE briefings SET current_revision_id = :r WHERE id = :b`, {
      replacements: { r: r!.id, b: b!.id },
      transaction: t,
    });
    return { id: b!.id, revisionId: r!.id };
  });
}

/** A scheduled session with attendees, in the timetable area's tables (contract names). */
export async function makeSession(
  s: { school: { id: string }; people: { instructor: { id: string } } },
  briefing: { id: string; revisionId: string },
  startsAt: Date,
  studentIds: string[],
  room = `Room ${randomUUID().slice(0, 6)}`,
) {
  return sequelize.transaction(async (t) => {
    const [row] = await sequelize.query<{ id: string }>(
      `INSERT INTO training_sessions (school_id, briefing_id, briefing_revision_id, starts_at, ends_at, room, instructor_id, created_by)
       VALUES (:s, :b, :r, :a, :e, :room, :i, :i) RETURNING id`,
      {
        replacements: {
          s: s.school.id,
          b: briefing.id,
          r: briefing.revisionId,
          a: startsAt,
          e: new Date(startsAt.getTime() + 90 * 60_000),
          room,
          i: s.people.instructor.id,
        },
        type: QueryTypes.SELECT,
        transaction: t,
      },
    );
    for (const sid of studentIds) {
      await sequelize.query(`INSERT INTO session_attendees (session_id, student_id) VALUES (:id, :sid)`, {
        replacements: { id: row!.id, sid },
        transaction: t,
      });
    }
    return row!.id;
  });
}

/** What the timetable does on a reschedule: new time, sequence + 1. */
export async function moveSession(sessionId: string, startsAt: Date) {
  await sequelize.query(
    `UPDATE training_sessions SET starts_at = :a, ends_at = :e, sequence = sequence + 1, updated_at = now() WHERE id = :id`,
    { replacements: { a: startsAt, e: new Date(startsAt.getTime() + 90 * 60_000), id: sessionId } },
  );
}
