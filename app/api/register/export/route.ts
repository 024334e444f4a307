// GET /api/register/export: the Sign-off register as CSV (same filters as the page, every matching
// row, streamed as batches are read), with the audit chain's head hash.
import { route, parseQuery } from "@/lib/http/api";
import { registerRowBatches, type RegisterRow } from "@/db/access/records/sign-off-register";
import { chainHead } from "@/db/access/records/audit-chain";
import { registerQuerySchema, toFilter } from "@/lib/records/schema";
import { toCsv, toCsvRows } from "@/lib/csv";
import { now } from "@/lib/clock";
import { SIGN_OFF_STATE_WORDS, STAGE_RESULT_WORDS, words } from "@/lib/labels";

export const GET = route("register.view", async ({ req, user }) => {
  const q = parseQuery(req, registerQuerySchema);
  const head = await chainHead(user.schoolId);
  const header = [
    "kind",
    "date",
    "student",
    "cohort",
    "stage",
    "item",
    "title",
    "signer or examiner",
    "basis",
    "state",
    "reason",
    "watch notes",
    "recorded at",
    "signature hash",
  ];
  const line = (r: RegisterRow) => [
    r.kind === "sign_off" ? "sign-off" : "stage check",
    r.date,
    r.studentName,
    r.cohortName ?? "",
    r.stageCode,
    r.itemCode ?? "",
    r.itemTitle ?? "",
    r.signerName,
    r.basis,
    words({ ...SIGN_OFF_STATE_WORDS, ...STAGE_RESULT_WORDS }, r.state),
    r.reason ?? "",
    r.notes.map((n) => `${n.label}: ${n.detail}`).join(" | "),
    r.recordedAt.toISOString(),
    r.signatureHash,
  ];
  const trailer = [
    [],
    ["audit chain head hash", head.hash],
    ["audit chain length", String(head.position)],
    ["exported at", now().toISOString()],
  ];
  const encoder = new TextEncoder();
  const batches = registerRowBatches(user, toFilter(q));
  let started = false;
  const csv = new ReadableStream<Uint8Array>({
    async pull(controller) {
      try {
        if (!started) {
          started = true;
          controller.enqueue(encoder.encode(toCsv(header, [])));
          return;
        }
        const next = await batches.next();
        if (next.done) {
          controller.enqueue(encoder.encode(toCsvRows(trailer)));
          controller.close();
          return;
        }
        controller.enqueue(encoder.encode(toCsvRows(next.value.map(line))));
      } catch (e) {
        controller.error(e);
      }
    },
    async cancel() {
      await batches.return(undefined);
    },
  });
  return new Response(csv, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="sign-off-register-${now().toISOString().slice(0, 10)}.csv"`,
      "Cache-Control": "no-store",
      "X-Audit-Head": head.hash,
    },
  });
});
