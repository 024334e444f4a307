jest.setTimeout(120_000);
import { randomUUID } from "node:crypto";
import { QueryTypes, Sequelize } from "sequelize";
import pg from "pg";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { writeAudit, verifyChain, chainHead } from "@/db/access/records/audit-chain";
import { check, sign, itemId } from "./helpers";

// The owner role (DATABASE_OWNER_URL, exported by the test command) plays the tamperer: it owns
// the tables, so it can switch the triggers off. The app role (DATABASE_URL) cannot.
const owner = new Sequelize(process.env.DATABASE_OWNER_URL!, { dialect: "postgres", dialectModule: pg, logging: false });
afterAll(async () => {
  await owner.close();
  await closeDb();
});

async function freshChain(rows = 6) {
  const s = await makeSchool("chain");
  for (let i = 0; i < rows; i++) {
    await sequelize.transaction((t) =>
      writeAudit(t, {
        schoolId: s.school.id,
        actor: s.as.chief,
        action: "test.event",
        recordType: "test",
        recordId: randomUUID(),
        after: { i, note: `event ${i}` },
      }),
    );
  }
  return s.school.id;
}

async function asOwnerWithoutTriggers(sql: string, replacements: Record<string, unknown>) {
  await owner.transaction(async (t) => {
    await owner.query(`ALTER TABLE audit_events DISABLE TRIGGER USER`, { transaction: t });
    await owner.query(sql, { replacements, transaction: t });
    await owner.query(`ALTER TABLE audit_events ENABLE TRIGGER USER`, { transaction: t });
  });
}

async function rowAt(schoolId: string, pos: number) {
  const [r] = await sequelize.query<{ seq: string; id: string; hash: string }>(
    `SELECT seq, id, hash FROM audit_events WHERE school_id = :s AND chain_pos = :p`,
    {
      replacements: { s: schoolId, p: pos },
      type: QueryTypes.SELECT,
    },
  );
  return r!;
}

async function expectFails(sql: string) {
  await expect(sequelize.query(sql)).rejects.toThrow();
}

describe("PostgreSQL refuses changes to the audit trail and to signed records", () => {
  it("as the app's role: UPDATE, DELETE, TRUNCATE and DISABLE TRIGGER on audit_events fail", async () => {
    const schoolId = await freshChain(2);
    await expectFails(`UPDATE audit_events SET action = 'x' WHERE school_id = '${schoolId}'`);
    await expectFails(`DELETE FROM audit_events WHERE school_id = '${schoolId}'`);
    await expectFails(`TRUNCATE audit_events`);
    await expect(sequelize.query(`ALTER TABLE audit_events DISABLE TRIGGER ALL`)).rejects.toThrow(/owner/);
    await expect(sequelize.query(`ALTER TABLE audit_events DISABLE TRIGGER audit_events_no_update`)).rejects.toThrow(/owner/);
    expect((await verifyChain(schoolId)).ok).toBe(true);
  });

  it("even the owner, with the triggers on, cannot update or delete audit rows or signed records", async () => {
    const s = await makeSchool("signed");
    const item = await itemId(s, "AER-01");
    await check(s.as.instructor, s.people.students[0]!.id, [item]);
    const so = await sign(s.as.instructor, { studentId: s.people.students[0]!.id, itemId: item });
    await expect(owner.query(`UPDATE sign_offs SET statement = 'changed' WHERE id = :id`, { replacements: { id: so.id } })).rejects.toThrow(
      /append-only/,
    );
    await expect(owner.query(`DELETE FROM sign_offs WHERE id = :id`, { replacements: { id: so.id } })).rejects.toThrow(/append-only/);
    await expect(
      owner.query(`UPDATE audit_events SET after = '{}' WHERE school_id = :s`, { replacements: { s: s.school.id } }),
    ).rejects.toThrow(/append-only/);
    await expect(sequelize.query(`UPDATE oral_check_questions SET outcome = 'solid'`)).rejects.toThrow();
    await expect(sequelize.query(`DELETE FROM sign_off_withdrawals`)).rejects.toThrow();
  });

  it("a hash written by the caller is ignored: the database computes position and hash itself", async () => {
    const schoolId = await freshChain(1);
    await sequelize.query(
      `INSERT INTO audit_events (school_id, actor_roles, action, record_type, record_id, occurred_at, chain_pos, prev_hash, hash, seq)
       VALUES (:s, '{}', 'forged', 'test', gen_random_uuid(), now(), 99, 'abc', 'def', 1)`,
      { replacements: { s: schoolId } },
    );
    const head = await rowAt(schoolId, 2);
    expect(head.hash).toMatch(/^[0-9a-f]{64}$/);
    expect((await verifyChain(schoolId)).ok).toBe(true);
  });
});

describe("tampering as the owner is reported at the right place", () => {
  it("an edited payload", async () => {
    const schoolId = await freshChain();
    const target = await rowAt(schoolId, 3);
    await asOwnerWithoutTriggers(`UPDATE audit_events SET after = '{"i": 2, "note": "edited"}' WHERE id = :id`, { id: target.id });
    const v = await verifyChain(schoolId);
    expect(v.ok).toBe(false);
    expect(v.broken).toMatchObject({ position: 3, id: target.id });
    expect(v.broken!.problem).toMatch(/changed/);
    expect(v.checked).toBe(2);
  });

  it("a deleted middle row", async () => {
    const schoolId = await freshChain();
    const target = await rowAt(schoolId, 4);
    const next = await rowAt(schoolId, 5);
    await asOwnerWithoutTriggers(`DELETE FROM audit_events WHERE id = :id`, { id: target.id });
    const v = await verifyChain(schoolId);
    expect(v.ok).toBe(false);
    expect(v.broken).toMatchObject({ position: 4, id: next.id });
    expect(v.broken!.problem).toMatch(/missing/);
  });

  it("a forged row inserted in the middle, even with a well-formed hash: the next link no longer holds", async () => {
    const schoolId = await freshChain();
    const before = await rowAt(schoolId, 2);
    const after = await rowAt(schoolId, 3);
    // the forger makes room at position 3, links a new row to row 2 and computes its hash with the database's own function
    await asOwnerWithoutTriggers(
      `UPDATE audit_events SET chain_pos = -(chain_pos + 1) WHERE school_id = :s AND chain_pos >= 3;
       UPDATE audit_events SET chain_pos = -chain_pos WHERE school_id = :s AND chain_pos < 0;
       INSERT INTO audit_events (seq, school_id, chain_pos, actor_roles, action, record_type, record_id, after, occurred_at, prev_hash, hash)
       VALUES (nextval('audit_events_seq'), :s, 3, '{chief}', 'signoff.signed', 'sign_off', gen_random_uuid(), '{"forged": true}', now(), :prev, '');
       UPDATE audit_events e SET hash = audit_hash(e.prev_hash, e) WHERE school_id = :s AND chain_pos = 3;`,
      { s: schoolId, prev: before.hash },
    );
    const v = await verifyChain(schoolId);
    expect(v.ok).toBe(false);
    // rows 1-3 hang together (the forged row 3 links to row 2); the former row 3, now at 4, does not link to it
    expect(v.broken).toMatchObject({ position: 4, id: after.id });
    expect(v.broken!.problem).toMatch(/does not link/);
  });

  it("a forged row appended with a made-up hash", async () => {
    const schoolId = await freshChain();
    const last = await rowAt(schoolId, 6);
    await asOwnerWithoutTriggers(
      `INSERT INTO audit_events (seq, school_id, chain_pos, actor_roles, action, record_type, record_id, after, occurred_at, prev_hash, hash)
       VALUES (nextval('audit_events_seq'), :s, 7, '{chief}', 'signoff.signed', 'sign_off', gen_random_uuid(), '{"forged": true}', now(), :prev, repeat('a', 64))`,
      { s: schoolId, prev: last.hash },
    );
    const v = await verifyChain(schoolId);
    expect(v.broken).toMatchObject({ position: 7 });
    expect(v.broken!.problem).toMatch(/changed/);
    expect(v.checked).toBe(6);
  });

  it("two swapped rows", async () => {
    const schoolId = await freshChain();
    const a = await rowAt(schoolId, 2);
    const b = await rowAt(schoolId, 3);
    await asOwnerWithoutTriggers(
      `UPDATE audit_events SET chain_pos = -1 WHERE id = :a; UPDATE audit_events SET chain_pos = 2 WHERE id = :b; UPDATE audit_events SET chain_pos = 3 WHERE id = :a;`,
      { a: a.id, b: b.id },
    );
    const v = await verifyChain(schoolId);
    expect(v.ok).toBe(false);
    expect(v.broken).toMatchObject({ position: 2, id: b.id });
  });

  it("an untouched chain verifies, and its head is the newest row's hash", async () => {
    const schoolId = await freshChain();
    const v = await verifyChain(schoolId);
    expect(v).toMatchObject({ ok: true, checked: 6, broken: null });
    expect((await chainHead(schoolId)).hash).toBe(v.headHash);
    expect(v.headHash).toBe((await rowAt(schoolId, 6)).hash);
  });
});

describe("concurrent writers cannot fork the chain", () => {
  it("50 concurrent writers on different records leave a chain that verifies", async () => {
    const s = await makeSchool("concurrent");
    const ids = Array.from({ length: 50 }, () => randomUUID());
    await Promise.all(
      ids.map((id, i) =>
        sequelize.transaction(async (t) => {
          await writeAudit(t, {
            schoolId: s.school.id,
            actor: s.as.instructor,
            action: "test.concurrent",
            recordType: "test",
            recordId: id,
            after: { i },
          });
          // hold the transaction open a moment so the writers overlap
          await sequelize.query(`SELECT pg_sleep(0.01)`, { transaction: t });
        }),
      ),
    );
    const v = await verifyChain(s.school.id);
    expect(v).toMatchObject({ ok: true, checked: 50 });
    const rows = await sequelize.query<{ record_id: string }>(`SELECT record_id FROM audit_events WHERE school_id = :s`, {
      replacements: { s: s.school.id },
      type: QueryTypes.SELECT,
    });
    expect(new Set(rows.map((r) => r.record_id))).toEqual(new Set(ids));
  });
});
