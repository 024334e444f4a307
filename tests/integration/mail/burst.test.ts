// Faults under load (issue 16): a burst of mails while SMTP refuses connections, the real worker
// process killed with SIGKILL in the middle of it, SMTP back, a new worker: every mail arrives at
// the SMTP sink exactly once and has exactly one mail_deliveries row. A second test kills a worker
// while it is sending: nothing is lost, and only the mails that may have been in flight (accepted by
// SMTP, not yet committed: at most one per sender of the worker, WORKER_CONCURRENCY) may arrive
// twice, each with the same Message-ID.
import { randomUUID } from "node:crypto";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { enqueueMail } from "@/db/access/mail/outbox";
import { composeMail } from "@/lib/mail/compose";
import { closeDb, makeSchool } from "../../helpers/factories";
import { spawn } from "node:child_process";
import { freePort, testSink, waitFor, type WorkerProcess } from "./helpers";

jest.setTimeout(240_000);

let school: Awaited<ReturnType<typeof makeSchool>>;
const workers: WorkerProcess[] = [];

beforeAll(async () => {
  school = await makeSchool("mail-burst");
});
afterEach(async () => {
  while (workers.length) await workers.pop()!.stop();
});
afterAll(closeDb);

/**
 * The real worker as ONE process (`node --import tsx`), so SIGKILL hits the worker itself: the
 * tsx command line (helpers.ts spawnWorker) runs it as a child of its own, and killing that
 * wrapper from outside would leave the worker running on.
 */
/** How many mails the worker sends at once (CHALKWING_MAIL_CONCURRENCY), so how many can be in flight at a kill. */
const WORKER_CONCURRENCY = 4;

function worker(port: number): WorkerProcess {
  let out = "";
  const child = spawn(process.execPath, ["--conditions=react-server", "--import", "tsx", "lib/mail/worker.ts"], {
    cwd: process.cwd(),
    env: {
      ...process.env,
      SMTP_HOST: "127.0.0.1",
      SMTP_PORT: String(port),
      CHALKWING_MAIL_TICK_SECONDS: "0.5",
      CHALKWING_MAIL_RETRY_DELAY: "1",
      CHALKWING_MAIL_RETRY_LIMIT: "10",
      CHALKWING_MAIL_JOB_EXPIRE_SECONDS: "2",
      CHALKWING_MAIL_MAINTENANCE_SECONDS: "1",
      CHALKWING_MAIL_PRODUCERS: "off",
      CHALKWING_MAIL_CONCURRENCY: String(WORKER_CONCURRENCY),
    },
    stdio: ["ignore", "pipe", "pipe"],
  });
  child.stdout?.on("data", (d: Buffer) => (out += d.toString()));
  child.stderr?.on("data", (d: Buffer) => (out += d.toString()));
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) =>
    child.once("exit", (code, signal) => resolve({ code, signal })),
  );
  const w: WorkerProcess = {
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
  workers.push(w);
  return w;
}

/** `count` mails under one prefix, written `perTx` to a transaction, the transactions side by side. */
async function enqueueBurst(prefix: string, count: number, perTx = 10): Promise<void> {
  const mail = composeMail(
    "record.signed",
    { name: "Ada Quill", itemCode: "AER-03", itemTitle: "Total drag", signerName: "Instructor One", signedOn: "2026-12-01" },
    { name: school.school.name, timeZone: "Europe/London" },
  );
  const batches: Promise<void>[] = [];
  for (let start = 0; start < count; start += perTx) {
    const n = Math.min(perTx, count - start);
    batches.push(
      sequelize.transaction(async (t) => {
        for (let i = 0; i < n; i++) {
          const key = `${prefix}:${randomUUID()}`;
          const to = `student.${randomUUID().slice(0, 6)}@chalkwing.test`;
          await enqueueMail(t, { schoolId: school.school.id, kind: "record.signed", idempotencyKey: key, to, ...mail });
        }
      }),
    );
  }
  await Promise.all(batches);
}

interface Row {
  id: string;
  state: string;
  attempts: number;
  message_id: string;
  deliveries: number;
}

async function rowsOf(prefix: string): Promise<Row[]> {
  return sequelize.query<Row>(
    `SELECT o.id, o.state, o.attempts, o.message_id, (SELECT count(*)::int FROM mail_deliveries d WHERE d.outbox_id = o.id) AS deliveries
       FROM outbox o WHERE o.idempotency_key LIKE :p ORDER BY o.created_at`,
    { replacements: { p: `${prefix}:%` }, type: QueryTypes.SELECT },
  );
}

async function kill(w: WorkerProcess): Promise<void> {
  w.child.kill("SIGKILL");
  const exit = await w.exited;
  expect(exit.signal).toBe("SIGKILL");
  // the worker process itself is gone (no child of a wrapper left running)
  expect(() => process.kill(w.child.pid!, 0)).toThrow();
}

function copiesAtSink(sink: { received: { messageId: string }[] }, rows: Row[]): Map<string, number> {
  const mine = new Set(rows.map((r) => r.message_id));
  const copies = new Map<string, number>();
  for (const m of sink.received) if (mine.has(m.messageId)) copies.set(m.messageId, (copies.get(m.messageId) ?? 0) + 1);
  return copies;
}

test("a burst with SMTP down and the worker killed mid-burst: every mail arrives exactly once after SMTP and a new worker are back", async () => {
  const prefix = `test.burst.down.${randomUUID().slice(0, 8)}`;
  const total = 60;
  const port = await freePort(); // nothing listens here: SMTP refuses connections
  await enqueueBurst(prefix, 30);
  const first = worker(port);
  await enqueueBurst(prefix, 20); // the burst goes on while the worker runs
  // mid-burst: some mails have failed an attempt, others are still waiting
  await waitFor(
    "part of the burst to fail an attempt",
    async () => (await rowsOf(prefix)).filter((r) => r.attempts >= 1).length >= 8,
    90_000,
  );
  await kill(first);
  await enqueueBurst(prefix, total - 50); // more mail while no worker runs

  const down = await rowsOf(prefix);
  expect(down).toHaveLength(total);
  expect(down.every((r) => r.state === "queued" && r.deliveries === 0)).toBe(true);

  const sink = await testSink(port);
  try {
    worker(port);
    await waitFor("every mail of the burst to be sent", async () => (await rowsOf(prefix)).every((r) => r.state === "sent"), 180_000);
    const rows = await rowsOf(prefix);
    expect(rows).toHaveLength(total);
    expect(rows.filter((r) => r.deliveries !== 1)).toEqual([]);
    const copies = copiesAtSink(sink, rows);
    expect(copies.size).toBe(total);
    expect([...copies.values()].filter((n) => n !== 1)).toEqual([]);
  } finally {
    await sink.close();
  }
});

test("a worker killed while it sends a burst: nothing is lost, one delivery row each, and only the mails in flight may arrive twice", async () => {
  const prefix = `test.burst.sending.${randomUUID().slice(0, 8)}`;
  const total = 40;
  const sink = await testSink();
  try {
    await enqueueBurst(prefix, total);
    const first = worker(sink.port);
    await waitFor(
      "part of the burst to be sent",
      async () => {
        const sent = (await rowsOf(prefix)).filter((r) => r.state === "sent").length;
        return sent >= 5;
      },
      90_000,
    );
    await kill(first);
    const atKill = (await rowsOf(prefix)).filter((r) => r.state === "sent").length;
    expect(atKill).toBeLessThan(total); // killed mid-burst, not after it

    worker(sink.port);
    await waitFor("every mail of the burst to be sent", async () => (await rowsOf(prefix)).every((r) => r.state === "sent"), 180_000);
    const rows = await rowsOf(prefix);
    expect(rows).toHaveLength(total);
    expect(rows.filter((r) => r.deliveries !== 1)).toEqual([]);
    const copies = copiesAtSink(sink, rows);
    expect(copies.size).toBe(total); // every Message-ID arrived
    // at-least-once by design (lib/mail/deliver.ts): a kill between SMTP's acceptance and the
    // commit sends that mail again with the same Message-ID; the killed worker had at most
    // WORKER_CONCURRENCY mails in flight
    const twice = [...copies.values()].filter((n) => n > 1);
    expect(twice.length).toBeLessThanOrEqual(WORKER_CONCURRENCY);
    expect(twice.every((n) => n === 2)).toBe(true);
  } finally {
    await sink.close();
  }
});
