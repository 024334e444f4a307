// Delivery from the outbox through pg-boss over real SMTP on loopback, with the real worker
// as a child process: the three kill points, SMTP down then up, retries running out, and a
// rolled-back change that leaves no outbox row.
import { randomUUID } from "node:crypto";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { enqueueMail, messageIdFor } from "@/db/access/mail/outbox";
import { composeMail } from "@/lib/mail/compose";
import { closeDb, makeSchool } from "../../helpers/factories";
import { deliveriesOf, freePort, outboxRow, parseStored, spawnWorker, testSink, waitFor, type WorkerProcess } from "./helpers";

jest.setTimeout(120_000);

let school: Awaited<ReturnType<typeof makeSchool>>;
const workers: WorkerProcess[] = [];

beforeAll(async () => {
  school = await makeSchool("mail-delivery");
});
afterEach(async () => {
  while (workers.length) await workers.pop()!.stop();
});
afterAll(closeDb);

async function queueMail(prefix: string, to = `student.${randomUUID().slice(0, 6)}@chalkwing.test`) {
  const key = `${prefix}:${randomUUID()}`;
  const mail = composeMail(
    "record.signed",
    { name: "Ada Quill", itemCode: "AER-03", itemTitle: "Total drag", signerName: "Instructor One", signedOn: "2026-12-01" },
    { name: school.school.name, timeZone: "Europe/London" },
  );
  await sequelize.transaction((t) =>
    enqueueMail(t, { schoolId: school.school.id, kind: "record.signed", idempotencyKey: key, to, ...mail }),
  );
  return key;
}

function worker(port: number, env: Record<string, string> = {}) {
  const w = spawnWorker(port, env);
  workers.push(w);
  return w;
}

const copiesOf = (sink: { received: { messageId: string }[] }, messageId: string) =>
  sink.received.filter((m) => m.messageId === messageId).length;

describe.each([
  ["before-send", 1],
  ["after-accept", 2],
  ["after-commit", 1],
] as const)("a worker killed at %s", (point, expectedCopies) => {
  test(`loses nothing; the mail arrives ${expectedCopies === 1 ? "exactly once" : "twice with the same Message-ID"} and has one delivery row`, async () => {
    const sink = await testSink();
    try {
      const prefix = `test.kill.${point}`;
      const key = await queueMail(prefix);
      const row = (await outboxRow(key))!;
      expect(row.message_id).toBe(messageIdFor(key));

      const first = worker(sink.port, { CHALKWING_MAIL_CRASH_AT: point, CHALKWING_MAIL_CRASH_KEY: prefix });
      const exit = await Promise.race([first.exited, new Promise<null>((r) => setTimeout(() => r(null), 60_000))]);
      // tsx passes the child's SIGKILL on as exit code 137 (128 + 9)
      expect(exit && (exit.signal === "SIGKILL" || exit.code === 137)).toBe(true);
      expect(first.output()).toContain(`crashing at ${point}`);

      // what the crash left behind
      const afterCrash = (await outboxRow(key))!;
      if (point === "after-commit") {
        expect(afterCrash.state).toBe("sent");
        expect(copiesOf(sink, row.message_id)).toBe(1);
      } else {
        expect(afterCrash.state).toBe("queued");
        expect(await deliveriesOf(row.id)).toBe(0);
        expect(copiesOf(sink, row.message_id)).toBe(point === "before-send" ? 0 : 1);
      }

      // a fresh worker picks up the job once the dead one's job expires
      const second = worker(sink.port);
      await waitFor("the mail to be sent", async () => (await outboxRow(key))?.state === "sent");
      if (point === "after-commit") {
        // give the restarted worker time to retry the expired job, which must find the mail sent
        await waitFor("the expired job to be retried", async () => {
          const [j] = await sequelize.query<{ state: string }>(
            `SELECT j.state FROM pgboss.job j JOIN mail_jobs m ON m.job_id = j.id WHERE m.outbox_id = :id`,
            { replacements: { id: row.id }, type: QueryTypes.SELECT },
          );
          return j?.state === "completed";
        });
      }
      await second.stop();

      expect(copiesOf(sink, row.message_id)).toBe(expectedCopies);
      expect(await deliveriesOf(row.id)).toBe(1);
      const stored = sink.received.filter((m) => m.messageId === row.message_id);
      for (const m of stored) {
        const parsed = await parseStored(sink, m.file);
        expect(parsed.messageId).toBe(row.message_id);
        expect(parsed.subject).toBe("Signed off: AER-03 Total drag");
      }
    } finally {
      await sink.close();
    }
  });
});

test("SMTP down for a while: mails wait as queued with the error, retry, and all arrive once when it is back", async () => {
  const port = await freePort(); // nothing listens here yet
  const keys = [await queueMail("test.down"), await queueMail("test.down"), await queueMail("test.down")];
  worker(port);
  await waitFor("each mail to record a failed attempt", async () => {
    const rows = await Promise.all(keys.map(outboxRow));
    return rows.every((r) => r && r.attempts >= 1 && r.last_error);
  });
  const waiting = await Promise.all(keys.map(outboxRow));
  for (const r of waiting) {
    expect(r!.state).toBe("queued");
    expect(r!.last_error).toMatch(/ECONNREFUSED|connect/i);
  }

  const sink = await testSink(port);
  try {
    await waitFor("all mails to be sent", async () => (await Promise.all(keys.map(outboxRow))).every((r) => r?.state === "sent"));
    for (const k of keys) {
      const r = (await outboxRow(k))!;
      expect(copiesOf(sink, r.message_id)).toBe(1);
      expect(r.last_error).toBeNull();
      expect(await deliveriesOf(r.id)).toBe(1);
    }
  } finally {
    await sink.close();
  }
});

test("when the retries run out the outbox shows failed with the error", async () => {
  const port = await freePort();
  const key = await queueMail("test.fail");
  worker(port, { CHALKWING_MAIL_RETRY_LIMIT: "1" });
  const row = await waitFor("the mail to be marked failed", async () => {
    const r = await outboxRow(key);
    return r?.state === "failed" ? r : null;
  });
  expect(row.attempts).toBe(2); // the first try and one retry
  expect(row.last_error).toMatch(/ECONNREFUSED|connect/i);
  expect(await deliveriesOf(row.id)).toBe(0);
});

test("a rolled-back change leaves no outbox row", async () => {
  const key = `test.rollback:${randomUUID()}`;
  const noteBody = `rollback-${randomUUID()}`;
  await expect(
    sequelize.transaction(async (t) => {
      await sequelize.query(`INSERT INTO sponsor_notes (school_id, student_id, author_id, body) VALUES (:s, :st, :a, :b)`, {
        replacements: { s: school.school.id, st: school.people.students[0]!.id, a: school.people.instructor.id, b: noteBody },
        transaction: t,
      });
      const mail = composeMail(
        "check.notyet",
        { name: "Ada", itemCodes: ["AER-01"], checkedOn: "2026-12-01" },
        { name: "X", timeZone: "Europe/London" },
      );
      expect(
        await enqueueMail(t, { schoolId: school.school.id, kind: "check.notyet", idempotencyKey: key, to: "a@chalkwing.test", ...mail }),
      ).toBe(true);
      throw new Error("the change fails after the mail was written");
    }),
  ).rejects.toThrow("the change fails");
  expect(await outboxRow(key)).toBeNull();
  const [n] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM sponsor_notes WHERE body = :b`, {
    replacements: { b: noteBody },
    type: QueryTypes.SELECT,
  });
  expect(n!.n).toBe(0);
});
