jest.setTimeout(180_000);
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { RecordRefusal } from "@/db/access/records/refusals";
import { currentSignOffs } from "@/db/access/records/sign-offs";
import { verifyChain } from "@/db/access/records/audit-chain";
import { check, sign, itemId, auditCount } from "./helpers";

afterAll(closeDb);

it("50 concurrent sign-offs of one item give exactly one current sign-off, one audit row and one mail", async () => {
  const s = await makeSchool("race");
  const student = s.people.students[0]!.id;
  const item = await itemId(s, "AER-01");
  const c = await check(s.as.instructor, student, [item]);
  const signers = [s.as.instructor, s.as.chief];
  const results = await Promise.allSettled(
    Array.from({ length: 50 }, (_, i) => sign(signers[i % 2]!, { studentId: student, itemId: item })),
  );
  const ok = results.filter((r) => r.status === "fulfilled");
  const refused = results.filter((r): r is PromiseRejectedResult => r.status === "rejected");
  expect(ok).toHaveLength(1);
  expect(refused).toHaveLength(49);
  for (const r of refused) {
    expect(r.reason).toBeInstanceOf(RecordRefusal);
    expect((r.reason as RecordRefusal).reason).toBe("already_signed");
    expect((r.reason as RecordRefusal).status).toBe(409);
  }
  const [n] = await sequelize.query<{ n: number }>(
    `SELECT count(*)::int AS n FROM sign_offs WHERE student_id = :st AND syllabus_item_id = :i`,
    { replacements: { st: student, i: item }, type: QueryTypes.SELECT },
  );
  expect(n!.n).toBe(1);
  expect((await currentSignOffs(student)).filter((x) => x.itemId === item)).toHaveLength(1);
  // one audit row per thing that happened: the check, and the one sign-off
  expect(await auditCount(s.school.id, "check.recorded", c.id)).toBe(1);
  expect(await auditCount(s.school.id, "signoff.signed")).toBe(1);
  const [mails] = await sequelize.query<{ n: number }>(
    `SELECT count(*)::int AS n FROM outbox WHERE school_id = :s AND kind = 'record.signed'`,
    { replacements: { s: s.school.id }, type: QueryTypes.SELECT },
  );
  expect(mails!.n).toBe(1);
  expect(await verifyChain(s.school.id)).toMatchObject({ ok: true, checked: 2 });
});
