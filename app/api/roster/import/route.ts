// POST /api/roster/import: a roster CSV upload (raw body, size-capped): `?mode=preview` checks every row, `?mode=commit` imports all rows in one transaction.
import { NextResponse } from "next/server";
import { z } from "zod";
import { route, parseQuery } from "@/lib/http/api";
import { HttpError } from "@/lib/http/errors";
import { readLimited } from "@/lib/http/body";
import { previewRosterImport, importRosterFile } from "@/db/access/roster/import-roster";
import { ROSTER_MAX_BYTES } from "@/lib/roster/csv";

export const dynamic = "force-dynamic";

const query = z.object({ mode: z.enum(["preview", "commit"], "preview or commit") });

/** The body, refused with a 413 when declared or sent larger than `max` (the stream is cancelled at once, nothing drained). */
async function readCapped(req: Request, max: number): Promise<Buffer> {
  const tooBig = () => new HttpError(413, `file: larger than ${Math.round(max / 1024)} KB`, "file");
  const declared = Number(req.headers.get("content-length") ?? "0");
  if (declared > max) throw tooBig();
  const { bytes, over } = await readLimited(req.body, max, max);
  if (over) throw tooBig();
  return bytes;
}

export const POST = route("roster.manage", async ({ req, user }) => {
  const { mode } = parseQuery(req, query);
  const type = (req.headers.get("content-type") ?? "").split(";")[0]!.trim().toLowerCase();
  if (!["text/csv", "text/plain", "application/vnd.ms-excel", "application/octet-stream"].includes(type)) {
    throw new HttpError(415, "file: send the CSV file itself as text/csv", "file");
  }
  const body = await readCapped(req, ROSTER_MAX_BYTES);
  if (body.length === 0) throw new HttpError(400, "file: empty", "file");
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(body);
  } catch {
    throw new HttpError(415, "file: not UTF-8 text; save the sheet as CSV UTF-8", "file");
  }
  if (mode === "preview") return NextResponse.json(await previewRosterImport(user, text));
  const preview = await previewRosterImport(user, text);
  const bad = preview.rows.find((r) => r.problems.length > 0);
  if (preview.fileProblems.length > 0) throw new HttpError(422, preview.fileProblems[0]!, "file");
  if (bad) throw new HttpError(422, `line ${bad.line}: ${bad.problems[0]}`, "file");
  const result = await importRosterFile(user, text);
  return NextResponse.json(result);
});
