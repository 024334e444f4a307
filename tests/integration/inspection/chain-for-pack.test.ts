jest.setTimeout(180_000);
import { Sequelize } from "sequelize";
import pg from "pg";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { verifyChain } from "@/db/access/records/audit-chain";
import { runWalk, startWalk } from "@/db/access/records/audit-walks";
import { chainForPack } from "@/db/access/inspection/chain-for-pack";
import { countQueriesOf } from "@/tests/helpers/query-count";

// The inspection pack's chain verification rests on the latest full walk that ended ok (its last
// hash found again at its last position) and checks only the events after it; with no walk, or a
// changed row at the walk's last position, it walks the whole chain itself, as it always did. The
// verdict is the one-call walk's (audit_verify) in every case. The owner role plays the tamperer.
const owner = new Sequelize(process.env.DATABASE_OWNER_URL!, { dialect: "postgres", dialectModule: pg, logging: false });
afterAll(async () => {
  await owner.close();
  await closeDb();
});

type School = Awaited<ReturnType<typeof makeSchool>>;

async function addEvents(s: School, rows: number) {
  await sequelize.query(
    `INSERT INTO audit_events (school_id, actor_id, actor_roles, action, record_type, record_id, after, occurred_at, chain_pos, prev_hash, hash, seq)
     SELECT :s, :actor, '{chief}', 'test.pack', 'test', gen_random_uuid(), jsonb_build_object('i', i), now(), 0, '', '', 0
       FROM generate_series(1, :rows) i`,
    { replacements: { s: s.school.id, actor: s.as.chief.id, rows } },
  );
}

async function walkWhole(s: School) {
  const { walk } = await sequelize.transaction((t) => startWalk(t, s.as.chief));
  return (await runWalk(walk.id, { batchSize: 400 }))!;
}

async function changeRowAt(s: School, pos: number) {
  await owner.transaction(async (t) => {
    await owner.query(`ALTER TABLE audit_events DISABLE TRIGGER USER`, { transaction: t });
    await owner.query(`UPDATE audit_events SET after = '{"changed": true}' WHERE school_id = :s AND chain_pos = :p`, {
      replacements: { s: s.school.id, p: pos },
      transaction: t,
    });
    await owner.query(`ALTER TABLE audit_events ENABLE TRIGGER USER`, { transaction: t });
  });
}

it("with no full walk yet, walks the whole chain itself and says so", async () => {
  const s = await makeSchool("pack-chain-a");
  await addEvents(s, 500);
  const c = await chainForPack(s.school.id);
  const v = await verifyChain(s.school.id);
  expect(c).toMatchObject({ ok: true, checked: v.checked, headHash: v.headHash, headPosition: v.checked, basis: null });
});

it("builds on the latest full walk: checks only the events after it, with the same verdict and head", async () => {
  const s = await makeSchool("pack-chain-b");
  await addEvents(s, 1200);
  const walked = await walkWhole(s);
  expect(walked.state).toBe("ok");
  await addEvents(s, 30);
  const { value: c, queries } = await countQueriesOf(() => chainForPack(s.school.id));
  const v = await verifyChain(s.school.id);
  expect(c.ok).toBe(true);
  expect(c.checked).toBe(v.checked);
  expect(c.headHash).toBe(v.headHash);
  expect(c.basis).toMatchObject({ through: walked.checked, requestedBy: s.people.chief.name });
  expect(c.checked).toBe(walked.checked + 30);
  // the head, the walk, the row at its last position, the events after it: no full walk
  expect(queries).toBe(4);
});

it("finds a row changed after the walk past it, and a row changed at its last position makes it walk the whole chain", async () => {
  const s = await makeSchool("pack-chain-c");
  await addEvents(s, 600);
  const walked = await walkWhole(s);
  await addEvents(s, 50);
  await changeRowAt(s, walked.checked + 20);
  const after = await chainForPack(s.school.id);
  expect(after).toMatchObject({ ok: false, checked: walked.checked + 19, broken: { position: walked.checked + 20 } });
  expect(after.basis?.through).toBe(walked.checked);
  // the walk's own last row changed: its hash is not found again, so the pack walks everything
  await changeRowAt(s, walked.checked);
  const whole = await chainForPack(s.school.id);
  const v = await verifyChain(s.school.id);
  expect(whole.basis).toBeNull();
  expect(whole).toMatchObject({ ok: false, checked: v.checked, broken: { position: v.broken!.position } });
  expect(v.broken!.position).toBe(walked.checked);
});
