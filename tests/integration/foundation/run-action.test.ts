// runAction: permission first, zod, one transaction, and idempotency keys so a retried submit
// creates nothing twice. The work writes an outbox row (with a fresh key each time it runs),
// so the number of rows shows how often the work really ran.
import { randomUUID } from "node:crypto";
import { QueryTypes } from "sequelize";
import { z } from "zod";
import { sequelize } from "@/db/index";
import { runAction } from "@/lib/actions/run-action";
import { enqueueMail } from "@/db/access/mail/outbox";
import { HttpError } from "@/lib/http/errors";
import { makeSchool, closeDb, actAs } from "@/tests/helpers/factories";

afterAll(async () => {
  actAs(null);
  await closeDb();
});

let s: Awaited<ReturnType<typeof makeSchool>>;
beforeAll(async () => {
  s = await makeSchool("run-action");
});

const schema = z.object({ label: z.string().min(1), idempotencyKey: z.string().optional() });

/** A create whose work writes one outbox row tagged with `label`. */
function createThing(input: unknown, opts: { fail?: boolean; scope?: string } = {}) {
  return runAction(
    "today.view",
    schema,
    input,
    async ({ label }, { user, t }) => {
      await enqueueMail(t, {
        schoolId: s.school.id,
        kind: "test.thing",
        idempotencyKey: `thing:${randomUUID()}`,
        to: "x@chalkwing.test",
        subject: label,
        text: label,
        html: label,
        recipientId: user.id,
      });
      if (opts.fail) throw new HttpError(422, "label: refused after writing", "label");
      return { label, made: randomUUID() };
    },
    { idempotent: opts.scope ?? "test.thing" },
  );
}

async function rowsLabelled(label: string): Promise<number> {
  const [r] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM outbox WHERE school_id = :s AND subject = :label`, {
    replacements: { s: s.school.id, label },
    type: QueryTypes.SELECT,
  });
  return r?.n ?? -1;
}

test("signed out: 401 before any work", async () => {
  actAs(null);
  const label = `anon-${randomUUID()}`;
  expect(await createThing({ label })).toMatchObject({ ok: false, status: 401 });
  expect(await rowsLabelled(label)).toBe(0);
});

test("a role without the permission: 403 before any work", async () => {
  actAs(s.as.chief);
  const r = await runAction("assignments.complete", schema, { label: "x" }, async () => {
    throw new Error("must not run");
  });
  expect(r).toMatchObject({ ok: false, status: 403 });
});

test("bad input: 400 naming the field", async () => {
  actAs(s.as.student);
  const r = await createThing({ label: "" });
  expect(r).toMatchObject({ ok: false, status: 400 });
  expect(r.ok === false && r.fieldErrors?.label).toBeTruthy();
});

test("the same key twice: one row, and the second answer is the first result", async () => {
  actAs(s.as.student);
  const label = `twice-${randomUUID()}`;
  const key = `key-${randomUUID()}`;
  const first = await createThing({ label, idempotencyKey: key });
  const second = await createThing({ label, idempotencyKey: key });
  expect(first.ok).toBe(true);
  expect(second).toEqual({ ok: true, data: first.ok ? first.data : null, replayed: true });
  expect(await rowsLabelled(label)).toBe(1);
});

test("without a key, two submits make two rows", async () => {
  actAs(s.as.student);
  const label = `nokey-${randomUUID()}`;
  await createThing({ label });
  await createThing({ label });
  expect(await rowsLabelled(label)).toBe(2);
});

test("20 concurrent submits with one key: one row, every answer the same", async () => {
  actAs(s.as.student);
  const label = `burst-${randomUUID()}`;
  const key = `burst-${randomUUID()}`;
  const results = await Promise.all(Array.from({ length: 20 }, () => createThing({ label, idempotencyKey: key })));
  expect(await rowsLabelled(label)).toBe(1);
  const made = new Set(results.map((r) => (r.ok ? r.data.made : `failed ${JSON.stringify(r)}`)));
  expect(made.size).toBe(1);
  expect(results.filter((r) => r.ok && !r.replayed)).toHaveLength(1);
});

test("keys belong to a person: another person's same key creates their own row", async () => {
  const label = `per-person-${randomUUID()}`;
  const key = `shared-${randomUUID()}`;
  actAs(s.as.student);
  await createThing({ label, idempotencyKey: key });
  actAs(s.as.otherStudent);
  const other = await createThing({ label, idempotencyKey: key });
  expect(other).toMatchObject({ ok: true });
  expect(other.ok && other.replayed).toBeFalsy();
  expect(await rowsLabelled(label)).toBe(2);
});

test("a key reused for another kind of create is refused with 409", async () => {
  actAs(s.as.student);
  const key = `scope-${randomUUID()}`;
  await createThing({ label: `a-${key}`, idempotencyKey: key });
  const r = await createThing({ label: `b-${key}`, idempotencyKey: key }, { scope: "test.other" });
  expect(r).toMatchObject({ ok: false, status: 409 });
  expect(await rowsLabelled(`b-${key}`)).toBe(0);
});

test("a failure after writing rolls everything back, and the key stays free for a retry", async () => {
  actAs(s.as.student);
  const label = `fail-${randomUUID()}`;
  const key = `fail-${randomUUID()}`;
  expect(await createThing({ label, idempotencyKey: key }, { fail: true })).toMatchObject({ ok: false, status: 422 });
  expect(await rowsLabelled(label)).toBe(0);
  const retry = await createThing({ label, idempotencyKey: key });
  expect(retry).toMatchObject({ ok: true });
  expect(retry.ok && retry.replayed).toBeFalsy();
  expect(await rowsLabelled(label)).toBe(1);
});

test("a malformed key is refused", async () => {
  actAs(s.as.student);
  expect(await createThing({ label: "x", idempotencyKey: "no spaces allowed" })).toMatchObject({ ok: false, status: 400 });
});
