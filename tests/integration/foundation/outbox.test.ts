// The transactional outbox: a mail is written in the same transaction as the change that
// causes it, so a rolled-back change leaves no mail behind.
import { randomUUID } from "node:crypto";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { enqueueMail } from "@/db/access/mail/outbox";
import { makeSchool, closeDb } from "@/tests/helpers/factories";

afterAll(closeDb);

let s: Awaited<ReturnType<typeof makeSchool>>;
beforeAll(async () => {
  s = await makeSchool("outbox");
});

const mail = (key: string) => ({
  schoolId: s.school.id,
  kind: "test.note",
  idempotencyKey: key,
  to: "student@chalkwing.test",
  subject: "Note",
  text: "Hello",
  html: "<p>Hello</p>",
});

async function count(key: string): Promise<number> {
  const [r] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM outbox WHERE idempotency_key = :key`, {
    replacements: { key },
    type: QueryTypes.SELECT,
  });
  return r?.n ?? -1;
}

test("rolled back with its transaction: no outbox row", async () => {
  const key = `rollback:${randomUUID()}`;
  await expect(
    sequelize.transaction(async (t) => {
      expect(await enqueueMail(t, mail(key))).toBe(true);
      // the row is visible inside the transaction…
      const [inside] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM outbox WHERE idempotency_key = :key`, {
        replacements: { key },
        type: QueryTypes.SELECT,
        transaction: t,
      });
      expect(inside?.n).toBe(1);
      throw new Error("the change failed");
    }),
  ).rejects.toThrow("the change failed");
  // …and gone with it
  expect(await count(key)).toBe(0);
});

test("committed with its transaction: one queued row; the same key again writes nothing", async () => {
  const key = `commit:${randomUUID()}`;
  await sequelize.transaction(async (t) => {
    expect(await enqueueMail(t, mail(key))).toBe(true);
  });
  await sequelize.transaction(async (t) => {
    expect(await enqueueMail(t, mail(key))).toBe(false);
  });
  expect(await count(key)).toBe(1);
  const [row] = await sequelize.query<{ state: string }>(`SELECT state FROM outbox WHERE idempotency_key = :key`, {
    replacements: { key },
    type: QueryTypes.SELECT,
  });
  expect(row?.state).toBe("queued");
});
