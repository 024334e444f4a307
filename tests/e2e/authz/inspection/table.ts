// The inspection pack's row of the authorisation table: the chief instructor alone (records.inspect)
// gets a student's pack; everyone else is refused before anything about the student is read.
import type { AuthzTable } from "../types";

export const INSPECTION_TABLE: AuthzTable = {
  "GET /api/records/[studentId]/inspection-pack": {
    request: (fx) => ({ params: { studentId: fx.student } }),
    expect: {
      signedOut: 401,
      chief: {
        status: 200,
        check: (res) => {
          expect(res.headers.get("content-type")).toBe("application/pdf");
          expect(res.text.startsWith("%PDF-")).toBe(true);
          expect(res.headers.get("x-record-hash")).toMatch(/^[0-9a-f]{64}$/);
          expect(res.headers.get("x-audit-head")).toMatch(/^[0-9a-f]{64}$/);
        },
      },
      // the Kestrel lead teaches this student, the student is herself and the sponsor is linked: still refused
      instructor: 403,
      student: 403,
      sponsor: 403,
    },
    secrets: () => ["student@chalkwing.test"],
  },
};
