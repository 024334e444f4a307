import { HttpError } from "@/lib/http/errors";
import { findUnsafeText } from "@/lib/validation/text";
import { zodFieldError } from "@/lib/http/api";
import { readUpload } from "@/lib/http/body";
import { EVIDENCE_MAX_BYTES, transferCreditSchema, type TransferCreditInput } from "@/lib/transfers/schema";
import type { EvidenceFile } from "@/db/access/transfers/record-credit";
import { EXTENSIONS, baseName, extensionOf, sniffHandoutType } from "@/app/api/handouts/_lib/files";

// The transfer credit upload: one multipart form (the fields and the evidence file), read with a
// byte limit (lib/http/body.ts), every fault a 4xx naming its field. Files are recognised by their first bytes as
// handouts are (app/api/handouts/_lib/files.ts): PDF, PNG or JPEG.

/** Room for the form's text fields beside the largest file. */
const FIELDS_ALLOWANCE = 64 * 1024;
export const BODY_LIMIT = EVIDENCE_MAX_BYTES + FIELDS_ALLOWANCE;

const tooBig = () => new HttpError(413, `evidence: larger than the ${EVIDENCE_MAX_BYTES / 1024 / 1024} MB limit`, "evidence");

/** The form's fields (validated) and its evidence file (size and type checked). */
export async function readTransferForm(req: Request): Promise<{ input: TransferCreditInput; file: EvidenceFile }> {
  const type = req.headers.get("content-type") ?? "";
  if (!/^multipart\/form-data\s*;/i.test(type)) throw new HttpError(415, "body: send the form as multipart/form-data", "body");
  const bytes = await readUpload(req, BODY_LIMIT, tooBig);
  let form: FormData;
  try {
    form = await new Response(new Uint8Array(bytes), { headers: { "content-type": type } }).formData();
  } catch {
    throw new HttpError(400, "body: not a readable form", "body");
  }
  const text = (k: string) => {
    const v = form.get(k);
    return typeof v === "string" ? v : undefined;
  };
  const raw = {
    studentId: text("studentId"),
    sourceSchool: text("sourceSchool"),
    sourceApproved: text("sourceApproved"),
    creditedMinutes: text("creditedMinutes"),
    itemIds: form.getAll("itemIds").filter((v): v is string => typeof v === "string"),
    testKind: text("testKind"),
    testTakenOn: text("testTakenOn"),
    testResult: text("testResult"),
    note: text("note") ?? "",
    idempotencyKey: text("idempotencyKey") || undefined,
  };
  const unsafe = findUnsafeText(raw);
  if (unsafe) throw new HttpError(400, `${unsafe.field}: ${unsafe.message}`, unsafe.field);
  const parsed = transferCreditSchema.safeParse(raw);
  if (!parsed.success) throw zodFieldError(parsed.error);

  const evidence = form.get("evidence");
  if (!evidence || typeof evidence === "string")
    throw new HttpError(400, "evidence: attach the evidence from the earlier school (PDF, PNG or JPEG)", "evidence");
  if (evidence.size > EVIDENCE_MAX_BYTES) throw tooBig();
  if (evidence.size === 0) throw new HttpError(400, "evidence: the file is empty", "evidence");
  const content = Buffer.from(await evidence.arrayBuffer());
  const actual = sniffHandoutType(content.subarray(0, 16));
  if (!actual) throw new HttpError(415, "evidence: only PDF, PNG and JPEG files can be evidence", "evidence");
  const name = baseName(evidence.name || "evidence").slice(0, 255);
  if (!EXTENSIONS[actual].includes(extensionOf(name)))
    throw new HttpError(415, `evidence: the file's name does not match its content (${actual})`, "evidence");
  return { input: parsed.data, file: { fileName: name, contentType: actual, bytes: content } };
}
