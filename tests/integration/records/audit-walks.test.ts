jest.setTimeout(180_000);
import { QueryTypes, Sequelize } from "sequelize";
import pg from "pg";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { verifyChain, verifyChainSinceCheckpoint } from "@/db/access/records/audit-chain";
import { failWalk, handOverWalks, latestWalk, runWalk, startWalk, walkById } from "@/db/access/records/audit-walks";
import { CHAIN_PAGE_CHECK_LIMIT, chainPageData } from "@/db/access/records/chain-page";

// The full walk of the audit chain in batches (migration 0720, db/access/records/audit-walks.ts),
// against chains of a few thousand events written by the database's own chain trigger. The owner
// role (DATABASE_OWNER_URL) plays the tamperer, as in audit-chain.test.ts.
const owner = new Sequelize(process.env.DATABASE_OWNER_URL!, { dialect: "postgres", dialectModule: pg, logging: false });
afterAll(async () => {
  await owner.close();
  await closeDb();
});

const EVENTS = 3000;
const BATCH = 700; // batch boundaries at 700, 1400, 2100, 2800

type School = Awaited<ReturnType<typeof makeSchool>>;

/** A school whose chain holds `rows` events (one INSERT; the trigger links each row to the one before). */
async function chainOf(rows = EVENTS): Promise<School> {
  const s = await makeSchool("walk");
  await sequelize.query(
    `INSERT INTO audit_events (school_id, actor_id, actor_roles, action, record_type, record_id, after, occurred_at, chain_pos, prev_hash, hash, seq)
     SELECT :s, :actor, '{chief}', 'test.walk', 'test', gen_random_uuid(), jsonb_build_object('i', i), now(), 0, '', '', 0
       FROM generate_series(1, :rows) i`,
    { replacements: { s: s.school.id, actor: s.as.chief.id, rows } },
  );
  return s;
}

async function asOwnerWithoutTriggers(sql: string, replacements: Record<string, unknown>) {
  await owner.transaction(async (t) => {
    await owner.query(`ALTER TABLE audit_events DISABLE TRIGGER USER`, { transaction: t });
    await owner.query(sql, { replacements, transaction: t });
    await owner.query(`ALTER TABLE audit_events ENABLE TRIGGER USER`, { transaction: t });
  });
}

async function rowAt(schoolId: string, pos: number) {
  const [r] = await sequelize.query<{ id: string; hash: string }>(
    `SELECT id, hash FROM audit_events WHERE school_id = :s AND chain_pos = :p ORDER BY seq LIMIT 1`,
    { replacements: { s: schoolId, p: pos }, type: QueryTypes.SELECT },
  );
  return r!;
}

async function askForWalk(s: School) {
  return sequelize.transaction((t) => startWalk(t, s.as.chief));
}

/** Asks for a walk and walks it to the end in batches of `batch`, recording the progress seen in the table after each batch. */
async function walk(s: School, batch = BATCH) {
  const { walk: asked } = await askForWalk(s);
  const seen: { reported: number; checked: number; state: string }[] = [];
  const ended = await runWalk(asked.id, {
    batchSize: batch,
    afterBatch: async (reported) => {
      const row = await walkById(asked.id);
      seen.push({ reported, checked: row!.checked, state: row!.state });
    },
  });
  return { ended: ended!, seen };
}

describe("a full walk in batches", () => {
  it("an untouched chain: ok, checked = total, progress written to the table after every batch", async () => {
    const s = await chainOf();
    const { ended, seen } = await walk(s);
    expect(ended).toMatchObject({ state: "ok", checked: EVENTS, total: EVENTS, broken: null, requestedBy: "Chief" });
    expect(ended.finishedAt).not.toBeNull();
    expect(seen).toEqual([700, 1400, 2100, 2800, 3000].map((n) => ({ reported: n, checked: n, state: "running" })));
    // the same answer as the one-call walk
    expect(await verifyChain(s.school.id)).toMatchObject({ ok: true, checked: ended.checked });
    expect(await latestWalk(s.school.id)).toMatchObject({ id: ended.id, state: "ok" });
    // the walk left the checkpoint at its head: the next page visit checks nothing again
    expect(await verifyChainSinceCheckpoint(s.school.id)).toMatchObject({ ok: true, since: EVENTS, checked: EVENTS });
  });

  it.each([
    ["the last position of a batch", 1400],
    ["the first position of the next batch", 1401],
    ["the middle of a batch", 1777],
  ])("a changed row at %s is reported at its position", async (_where, pos) => {
    const s = await chainOf();
    const target = await rowAt(s.school.id, pos);
    await asOwnerWithoutTriggers(`UPDATE audit_events SET after = '{"i": "edited"}' WHERE id = :id`, { id: target.id });
    const { ended } = await walk(s);
    expect(ended).toMatchObject({ state: "broken", checked: pos - 1, total: EVENTS });
    expect(ended.broken).toMatchObject({ position: pos, id: target.id });
    expect(ended.broken!.problem).toMatch(/changed after it was written/);
  });

  it.each([
    ["the last position of a batch", 1400],
    ["the first position of the next batch", 1401],
  ])("a missing position at %s is reported there, as the one-call walk reports it", async (_where, pos) => {
    const s = await chainOf();
    const target = await rowAt(s.school.id, pos);
    const next = await rowAt(s.school.id, pos + 1);
    await asOwnerWithoutTriggers(`DELETE FROM audit_events WHERE id = :id`, { id: target.id });
    const { ended } = await walk(s);
    expect(ended).toMatchObject({ state: "broken", checked: pos - 1 });
    expect(ended.broken).toMatchObject({ position: pos, id: next.id });
    expect(ended.broken!.problem).toBe(`row at position ${pos} is missing (next row found is ${pos + 1})`);
    const one = await verifyChain(s.school.id);
    expect(one.broken).toMatchObject({ position: pos, id: next.id, problem: ended.broken!.problem });
  });

  it("a gap longer than a batch is a missing row, not a walk that stands still", async () => {
    const s = await chainOf();
    await asOwnerWithoutTriggers(`DELETE FROM audit_events WHERE school_id = :s AND chain_pos BETWEEN 701 AND 2500`, { s: s.school.id });
    const { ended } = await walk(s, 300);
    expect(ended).toMatchObject({ state: "broken", checked: 700 });
    expect(ended.broken).toMatchObject({ position: 701 });
    expect(ended.broken!.problem).toBe("row at position 701 is missing (next row found is 2501)");
  });

  it("rows removed from the end after the walk was asked for: missing below the head captured at the start", async () => {
    const s = await chainOf();
    const { walk: asked } = await askForWalk(s);
    expect(asked).toMatchObject({ state: "queued", total: EVENTS, checked: 0 });
    await asOwnerWithoutTriggers(`DELETE FROM audit_events WHERE school_id = :s AND chain_pos > 2800`, { s: s.school.id });
    const ended = (await runWalk(asked.id, { batchSize: BATCH }))!;
    expect(ended).toMatchObject({ state: "broken", checked: 2800, total: EVENTS });
    expect(ended.broken).toMatchObject({ position: 2801, id: null });
    expect(ended.broken!.problem).toMatch(/^row at position 2801 is missing \(the chain ends at 2800; it reached 3000/);
    // the one-call walk cannot tell: it knows no head to reach
    expect((await verifyChain(s.school.id)).ok).toBe(true);
  });

  it("events written while the walk runs are left to the next check: the walk stops at the head captured at the start", async () => {
    const s = await chainOf(1000);
    const { walk: asked } = await askForWalk(s);
    let added = false;
    const ended = (await runWalk(asked.id, {
      batchSize: 400,
      afterBatch: async () => {
        if (added) return;
        added = true;
        await sequelize.query(
          `INSERT INTO audit_events (school_id, actor_roles, action, record_type, record_id, occurred_at, chain_pos, prev_hash, hash, seq)
           SELECT :s, '{}', 'test.later', 'test', gen_random_uuid(), now(), 0, '', '', 0 FROM generate_series(1, 50)`,
          { replacements: { s: s.school.id } },
        );
      },
    }))!;
    expect(ended).toMatchObject({ state: "ok", checked: 1000, total: 1000 });
  });

  it("a chain rewritten below the checkpoint, every hash recomputed so it links up again, does not match the kept checkpoint", async () => {
    const s = await chainOf(1500);
    await verifyChainSinceCheckpoint(s.school.id); // checkpoint at 1500
    await asOwnerWithoutTriggers(
      `UPDATE audit_events SET after = '{"i": "rewritten"}' WHERE school_id = '${s.school.id}' AND chain_pos = 900;
       DO $$
       DECLARE r audit_events; prev text;
       BEGIN
         SELECT hash INTO prev FROM audit_events WHERE school_id = '${s.school.id}' AND chain_pos = 899;
         FOR r IN SELECT * FROM audit_events WHERE school_id = '${s.school.id}' AND chain_pos >= 900 ORDER BY chain_pos LOOP
           r.prev_hash := prev;
           UPDATE audit_events SET prev_hash = prev, hash = audit_hash(prev, r) WHERE id = r.id RETURNING hash INTO prev;
         END LOOP;
       END $$;`,
      {},
    );
    expect((await verifyChain(s.school.id)).ok).toBe(true);
    const { ended } = await walk(s, 400);
    expect(ended).toMatchObject({ state: "broken", checked: 1500 });
    expect(ended.broken).toMatchObject({ position: 1500 });
    expect(ended.broken!.problem).toMatch(/no longer ends in the hash kept when it was last verified/);
  });
});

describe("a duplicated position (the owner drops the unique constraint first)", () => {
  let constraint = "";
  beforeAll(async () => {
    const [c] = await owner.query<{ conname: string }>(
      `SELECT conname FROM pg_constraint WHERE conrelid = 'audit_events'::regclass AND contype = 'u'
          AND pg_get_constraintdef(oid) = 'UNIQUE (school_id, chain_pos)'`,
      { type: QueryTypes.SELECT },
    );
    constraint = c!.conname;
    await owner.query(`ALTER TABLE audit_events DROP CONSTRAINT "${constraint}"`);
  });
  afterAll(async () => {
    // the copies go, then the constraint comes back
    await asOwnerWithoutTriggers(`DELETE FROM audit_events WHERE action = 'test.copy'`, {});
    await owner.query(`ALTER TABLE audit_events ADD CONSTRAINT "${constraint}" UNIQUE (school_id, chain_pos)`);
  });

  it.each([
    ["the last position of a batch", 1400],
    ["the first position of the next batch", 1401],
  ])("a copy of the row at %s is found at that position, as the one-call walk finds it", async (_where, pos) => {
    const s = await chainOf();
    const original = await rowAt(s.school.id, pos);
    await asOwnerWithoutTriggers(
      `INSERT INTO audit_events (seq, school_id, chain_pos, actor_id, actor_roles, action, record_type, record_id, before, after, occurred_at, prev_hash, hash)
       SELECT nextval('audit_events_seq'), school_id, chain_pos, actor_id, actor_roles, 'test.copy', record_type, record_id, before, after, occurred_at, prev_hash, hash
         FROM audit_events WHERE id = :id`,
      { id: original.id },
    );
    const { ended } = await walk(s);
    expect(ended).toMatchObject({ state: "broken", checked: pos });
    expect(ended.broken!.problem).toBe(`position ${pos} appears twice`);
    const one = await verifyChain(s.school.id);
    expect(one).toMatchObject({ ok: false, checked: pos });
    expect(ended.broken).toMatchObject({ position: one.broken!.position, id: one.broken!.id });
  });
});

describe("asking for a walk", () => {
  it("while one is queued or running, a second request returns it; once it ended, a new one starts", async () => {
    const s = await chainOf(50);
    const first = await askForWalk(s);
    expect(first).toMatchObject({ started: true, walk: { state: "queued", total: 50 } });
    const again = await sequelize.transaction((t) => startWalk(t, s.as.chief));
    expect(again).toMatchObject({ started: false, walk: { id: first.walk.id } });
    // two requests at the same moment still make one walk
    const both = await Promise.all([askForWalk(s), askForWalk(s)]);
    expect(both.map((b) => b.walk.id)).toEqual([first.walk.id, first.walk.id]);

    // while it runs (between two batches), a request still returns it
    let during: Awaited<ReturnType<typeof askForWalk>> | null = null;
    await runWalk(first.walk.id, {
      batchSize: 20,
      afterBatch: async () => {
        during ??= await askForWalk(s);
      },
    });
    expect(during).toMatchObject({ started: false, walk: { id: first.walk.id, state: "running", checked: 20 } });
    const rows = await sequelize.query<{ n: string }>(`SELECT count(*) AS n FROM audit_walks WHERE school_id = :s`, {
      replacements: { s: s.school.id },
      type: QueryTypes.SELECT,
    });
    expect(Number(rows[0]!.n)).toBe(1);

    const next = await askForWalk(s);
    expect(next.started).toBe(true);
    expect(next.walk.id).not.toBe(first.walk.id);
    // an ended walk is not walked again
    expect(await runWalk(first.walk.id, { batchSize: 20 })).toBeNull();
  });

  it("a walk of another school is not returned", async () => {
    const a = await chainOf(10);
    const b = await chainOf(10);
    const wa = await askForWalk(a);
    const wb = await askForWalk(b);
    expect(wb.started).toBe(true);
    expect(wb.walk.id).not.toBe(wa.walk.id);
    expect((await latestWalk(b.school.id))!.id).toBe(wb.walk.id);
  });
});

describe("handing walks to the queue", () => {
  const queue = { name: "audit.walk", schema: "pgboss" };
  /** The worker's enqueue, as pg-boss writes it: a job row in the queue's table, in the hand-over's transaction. */
  const handed: string[] = [];
  const enqueue = async (walkId: string, t: import("sequelize").Transaction) => {
    handed.push(walkId);
    const [row] = await sequelize.query<{ id: string }>(
      `INSERT INTO pgboss.job (name, data) VALUES ('audit.walk', CAST(:data AS jsonb)) RETURNING id`,
      { replacements: { data: JSON.stringify({ walkId }) }, type: QueryTypes.SELECT, transaction: t },
    );
    return row!.id;
  };

  it("a walk gets one live job; a job that ended without finishing the walk is replaced; an ended walk is not handed again", async () => {
    const s = await chainOf(10);
    const { walk } = await askForWalk(s);
    await handOverWalks(queue, enqueue);
    expect(handed.filter((id) => id === walk.id)).toHaveLength(1);
    const [marked] = await sequelize.query<{ job_id: string }>(`SELECT job_id FROM audit_walks WHERE id = :id`, {
      replacements: { id: walk.id },
      type: QueryTypes.SELECT,
    });
    const jobId = marked!.job_id;
    expect(jobId).toMatch(/^[0-9a-f-]{36}$/);
    await handOverWalks(queue, enqueue);
    expect(handed.filter((id) => id === walk.id)).toHaveLength(1);
    // the worker died and the retries ran out: the job failed, the walk is still queued
    await owner.query(`UPDATE pgboss.job SET state = 'failed' WHERE name = 'audit.walk' AND id = :id`, { replacements: { id: jobId } });
    await handOverWalks(queue, enqueue);
    expect(handed.filter((id) => id === walk.id)).toHaveLength(2);
    await runWalk(walk.id, { batchSize: 100 });
    await handOverWalks(queue, enqueue);
    expect(handed.filter((id) => id === walk.id)).toHaveLength(2);
  });

  it("a walk whose last retry failed ends as failed, with the reason, and the school may ask again", async () => {
    const s = await chainOf(10);
    const { walk } = await askForWalk(s);
    await failWalk(walk.id, "connection terminated");
    expect(await walkById(walk.id)).toMatchObject({ state: "failed", failure: "connection terminated", broken: null });
    expect(await runWalk(walk.id, { batchSize: 100 })).toBeNull();
    const again = await askForWalk(s);
    expect(again.started).toBe(true);
  });
});

describe("the chain page's reads", () => {
  /** The positions walked by each audit_verify* call `work` sends, and whether it sent a walk without an upper bound. */
  async function walksOf<T>(work: () => Promise<T>) {
    const spy = jest.spyOn(sequelize, "query");
    try {
      const value = await work();
      const calls = spy.mock.calls.map((c) => ({
        sql: String(c[0]),
        r: (c[1] as { replacements?: Record<string, unknown> })?.replacements,
      }));
      return {
        value,
        queries: calls.length,
        unbounded: calls.filter((c) => /audit_verify(_from)?\(/.test(c.sql)).length,
        ranges: calls.filter((c) => /audit_verify_range\(/.test(c.sql)).map((c) => Number(c.r!.to) - Number(c.r!.since)),
      };
    } finally {
      spy.mockRestore();
    }
  }

  it("check only the events since the checkpoint and read the latest walk: no walk of the whole chain", async () => {
    const s = await chainOf();
    await verifyChainSinceCheckpoint(s.school.id); // an earlier visit left the checkpoint at the head
    await sequelize.query(
      `INSERT INTO audit_events (school_id, actor_roles, action, record_type, record_id, occurred_at, chain_pos, prev_hash, hash, seq)
       SELECT :s, '{}', 'test.later', 'test', gen_random_uuid(), now(), 0, '', '', 0 FROM generate_series(1, 5)`,
      { replacements: { s: s.school.id } },
    );
    const { value, queries, unbounded, ranges } = await walksOf(() => chainPageData(s.school.id));
    expect(unbounded).toBe(0);
    expect(ranges).toEqual([CHAIN_PAGE_CHECK_LIMIT]);
    // the check past the checkpoint runs in one transaction under the school's advisory lock (begin, lock, commit)
    expect(queries).toBeLessThanOrEqual(9);
    // what was checked now: the five events after the checkpoint
    expect(value.v).toMatchObject({ ok: true, since: EVENTS, checked: EVENTS + 5, unchecked: 0 });
    expect(value.walk).toBeNull();
  });

  it("with no checkpoint yet, or more new events than a visit checks, a visit checks a bounded part and says what is left", async () => {
    const s = await chainOf();
    const first = await walksOf(() => chainPageData(s.school.id, { maxEvents: 1000 }));
    expect(first.unbounded).toBe(0);
    expect(first.ranges).toEqual([1000]);
    expect(first.value.v).toMatchObject({ ok: true, since: 0, checked: 1000, unchecked: EVENTS - 1000 });
    const second = await chainPageData(s.school.id, { maxEvents: 1000 });
    expect(second.v).toMatchObject({ ok: true, since: 1000, checked: 2000, unchecked: EVENTS - 2000 });
    // a full walk asked for meanwhile reads as such on the next visit
    const { walk: asked } = await askForWalk(s);
    const third = await chainPageData(s.school.id, { maxEvents: 1000 });
    expect(third.walk).toMatchObject({ id: asked.id, state: "queued", total: EVENTS });
  });
});
