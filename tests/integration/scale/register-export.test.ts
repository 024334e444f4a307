jest.setTimeout(180_000);
import { NextRequest } from "next/server";
import { parseCsv } from "@/lib/csv";
import { generateScale } from "@/db/seed/scale";
import { signOffRegister } from "@/db/access/records/sign-off-register";
import { chainHead } from "@/db/access/records/audit-chain";
import { GET } from "@/app/api/register/export/route";
import { makeSchool, actAs, closeDb } from "@/tests/helpers/factories";

// The register's CSV streams every matching row (read in batches of 500), in the register's
// order, and ends with the audit chain's head hash as it did before it was streamed.

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
