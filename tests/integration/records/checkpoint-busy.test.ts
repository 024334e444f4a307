import { QueryTypes, Sequelize } from "sequelize";
import pg from "pg";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { verifyChainSinceCheckpoint } from "@/db/access/records/audit-chain";

// One check of a school's chain past its checkpoint at a time: a visit that arrives while another
// holds the school's check (a transaction-level advisory lock) answers from the checkpoint, saying
// so (`busy`) and counting the events it left unchecked, and walks nothing; once the other ends,
// the next visit checks and moves the checkpoint as before.
const other = new Sequelize(process.env.DATABASE_URL!, { dialect: "postgres", dialectModule: pg, logging: false });
afterAll(async () => {
  await other.close();
  await closeDb();
});

async function addEvents(schoolId: string, actor: string, rows: number) {
  await sequelize.query(
    `INSERT INTO audit_events (school_id, actor_id, actor_roles, action, record_type, record_id, after, occurred_at, chain_pos, prev_hash, hash, seq)
     SELECT :s, :actor, '{chief}', 'test.busy', 'test', gen_random_uuid(), jsonb_build_object('i', i), now(), 0, '', '', 0
       FROM generate_series(1, :rows) i`,
    { replacements: { s: schoolId, actor, rows } },
  );
}

it("answers from the checkpoint while another visit checks the same school, then checks again", async () => {
  const s = await makeSchool("checkpoint-busy");
  const first = await verifyChainSinceCheckpoint(s.school.id, { maxEvents: 20_000 });
  expect(first).toMatchObject({ ok: true, busy: false, unchecked: 0 });
  await addEvents(s.school.id, s.people.chief.id, 40);

  let release!: () => void;
  const held = new Promise<void>((r) => (release = r));
  let locked!: () => void;
  const isLocked = new Promise<void>((r) => (locked = r));
  const holder = other.transaction(async (t) => {
    await other.query(`SELECT pg_advisory_xact_lock(hashtextextended('audit-checkpoint:' || CAST(:s AS text), 0))`, {
      replacements: { s: s.school.id },
      transaction: t,
    });
    locked();
    await held;
  });
  await isLocked;
  try {
    const spy = jest.spyOn(sequelize, "query");
    const busy = await verifyChainSinceCheckpoint(s.school.id, { maxEvents: 20_000 });
    const sent = spy.mock.calls.map((c) => String(c[0]));
    spy.mockRestore();
    expect(busy).toMatchObject({
      ok: true,
      busy: true,
      since: first.checked,
      checked: first.checked,
      headHash: first.headHash,
      unchecked: 40,
    });
    // the lock, the checkpoint and the head were read; no range of the chain was walked
    expect(sent.some((q) => /pg_try_advisory_xact_lock/.test(q))).toBe(true);
    expect(sent.filter((q) => /audit_verify/.test(q))).toEqual([]);
  } finally {
    release();
    await holder;
  }

  const after = await verifyChainSinceCheckpoint(s.school.id, { maxEvents: 20_000 });
  expect(after).toMatchObject({ ok: true, busy: false, since: first.checked, checked: first.checked + 40, unchecked: 0 });
  const [cp] = await sequelize.query<{ chain_pos: string }>(`SELECT chain_pos FROM audit_checkpoints WHERE school_id = :s`, {
    replacements: { s: s.school.id },
    type: QueryTypes.SELECT,
  });
  expect(Number(cp!.chain_pos)).toBe(first.checked + 40);
});
