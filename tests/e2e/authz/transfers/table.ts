// Transfers in: rows of the authorisation table. The chief's upload is refused on the cap of
// 14 CFR 141.77(c) (422 naming creditedMinutes), so it writes nothing and leaves the demo student's
// hours alone; the evidence of the seeded credit goes to the chief only.
import type { AuthzTable, Fixtures, HarnessResponse } from "../types";

const BOUNDARY = "chalkwing-harness-boundary-7d1f";
const PDF = Buffer.from("%PDF-1.4\n1 0 obj<<>>endobj\ntrailer<<>>\n%%EOF\n");

/** A multipart/form-data body (RFC 7578) with text fields and one file. */
function multipart(fields: Record<string, string>, file: { name: string; type: string; bytes: Buffer }): Buffer {
  const parts: Buffer[] = [];
  for (const [k, v] of Object.entries(fields))
    parts.push(Buffer.from(`--${BOUNDARY}\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`));
  parts.push(
    Buffer.from(
      `--${BOUNDARY}\r\nContent-Disposition: form-data; name="evidence"; filename="${file.name}"\r\nContent-Type: ${file.type}\r\n\r\n`,
    ),
    file.bytes,
    Buffer.from(`\r\n--${BOUNDARY}--\r\n`),
  );
  return Buffer.concat(parts);
}

const error = (res: HarnessResponse) => (res.json as { error?: { field?: string; message?: string } }).error;

export const TRANSFERS_TABLE: AuthzTable = {
  "POST /api/transfers/credits": {
    request: (fx: Fixtures) => ({
      rawBody: multipart(
        {
          studentId: fx.student,
          sourceSchool: "Harness earlier school",
          sourceApproved: "yes",
          creditedMinutes: "100000",
          testKind: "knowledge",
          testTakenOn: "2026-01-05",
          testResult: "Passed",
        },
        { name: "harness.pdf", type: "application/pdf", bytes: PDF },
      ),
      contentType: `multipart/form-data; boundary=${BOUNDARY}`,
    }),
    expect: {
      signedOut: 401,
      chief: {
        status: 422,
        check: (res) => {
          expect(error(res)?.field).toBe("creditedMinutes");
          expect(error(res)?.message).toMatch(/at most \d+ minutes .*141\.77\(c\)/);
        },
      },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    secrets: (fx) => [fx.student],
  },
  "GET /api/transfers/credits/[creditId]/evidence": {
    request: (fx) => ({ params: { creditId: fx.transferCredit! } }),
    expect: {
      signedOut: 401,
      chief: {
        status: 200,
        check: (res) => {
          expect(res.headers.get("content-type")).toBe("application/pdf");
          expect(res.headers.get("content-disposition")).toMatch(/^attachment; filename="/);
          expect(res.text.startsWith("%PDF-")).toBe(true);
        },
      },
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
  },
};
