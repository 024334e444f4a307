jest.setTimeout(180_000);
import { NextRequest } from "next/server";
import { parseCsv } from "@/lib/csv";
import { generateScale } from "@/db/seed/scale";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { signOffRegister, REGISTER_PAGE_SIZE } from "@/db/access/records/sign-off-register";
import { stagesWaiting } from "@/db/access/records/stages-waiting";
import { conductStageCheck } from "@/db/access/records/stage-checks";
import { chainHead } from "@/db/access/records/audit-chain";
import { GET } from "@/app/api/register/export/route";
import { makeSchool, actAs, closeDb, TEST_PASSWORD } from "@/tests/helpers/factories";

// The register's CSV streams every matching row (read in batches of 500), in the register's
// order, and ends with the audit chain's head hash as it did before it was streamed. Its pages,
// each read from the two parts (sign-offs, stage checks) cut at the page's end and merged, add up
// to the whole register in the same order.

afterAll(async () => {
  actAs(null);
  await closeDb();
});

it("streams every sign-off past the first batch, each once, with the head hash line at the end", async () => {
  const s = await makeSchool("export");
  await generateScale(110, { schoolId: s.school.id }); // 5 sign-offs each: 550 rows, two batches
  const all = await signOffRegister(s.as.chief, {}, { pageSize: null });
  expect(all.total).toBeGreaterThan(500);
  actAs(s.as.chief);
  const res = await GET(new NextRequest("http://127.0.0.1/api/register/export"), { params: Promise.resolve({}) });
  expect(res.status).toBe(200);
  expect(res.body).toBeInstanceOf(ReadableStream);
  const { header, rows } = parseCsv(await res.text());
  expect(header[0]).toBe("kind");
  const body = rows.filter((r) => r.kind === "sign-off" || r.kind === "stage check");
  expect(body.map((r) => r["signature hash"])).toEqual(all.rows.map((r) => r.signatureHash));
  const head = await chainHead(s.school.id);
  // the trailer's label sits in the first column, its value in the second ("date")
  expect(rows.find((r) => r.kind === "audit chain head hash")?.date).toBe(head.hash);
  expect(res.headers.get("X-Audit-Head")).toBe(head.hash);
});

it("pages of the register, read one after another, are the whole register in its order, sign-offs and stage checks merged", async () => {
  const s = await makeSchool("register-pages");
  await generateScale(30, { schoolId: s.school.id }); // 150 sign-offs: three pages and a part
  // three stage checks among the sign-offs: each of the two parts of a page is cut on its own, then merged
  const waiting = (await stagesWaiting(s.as.chief)).slice(0, 3);
  expect(waiting).toHaveLength(3);
  for (const w of waiting) {
    const items = await sequelize.query<{ stage_id: string; id: string }>(
      `SELECT g.id AS stage_id, i.id FROM syllabus_stages g JOIN syllabus_items i ON i.stage_id = g.id
        JOIN active_enrolments e ON e.revision_id = g.revision_id AND e.student_id = :student
        WHERE g.code = :code ORDER BY i.position`,
      { replacements: { student: w.studentId, code: w.stageCode }, type: QueryTypes.SELECT },
    );
    await sequelize.transaction((t) =>
      conductStageCheck(t, s.as.chief, {
        studentId: w.studentId,
        stageId: items[0]!.stage_id,
        result: "pass",
        oralOutcomes: items.map((i) => ({ itemId: i.id, outcome: "solid" as const })),
        writtenScorePercent: 90,
        remarks: "",
        occurredAt: new Date(Date.now() - 60_000),
        password: TEST_PASSWORD,
        overrideReason: "The generated cohorts are led by the demo instructors; no other examiner here.",
      }),
    );
  }
  const all = await signOffRegister(s.as.chief, {}, { pageSize: null });
  expect(all.rows.filter((r) => r.kind === "stage_check")).toHaveLength(3);
  const paged = [];
  for (let page = 1; ; page++) {
    const p = await signOffRegister(s.as.chief, {}, { page });
    expect(p.total).toBe(all.rows.length);
    if (p.rows.length === 0) break;
    expect(p.rows.length).toBeLessThanOrEqual(REGISTER_PAGE_SIZE);
    paged.push(...p.rows);
  }
  expect(paged.map((r) => `${r.kind}:${r.id}`)).toEqual(all.rows.map((r) => `${r.kind}:${r.id}`));
});
