// POST /api/briefings/[briefingId]/handouts: upload a handout (PDF, PNG or JPEG up to 10 MB) as the raw request body.
import { NextResponse } from "next/server";
import { z } from "zod";
import { route, parseQuery, uuidParam } from "@/lib/http/api";
import { HttpError } from "@/lib/http/errors";
import { readUpload } from "@/lib/http/body";
import { uploadHandout, HANDOUT_MAX_BYTES } from "@/db/access/briefings/handouts";
import { EXTENSIONS, extensionOf, mediaType, sniffHandoutType } from "@/app/api/handouts/_lib/files";

export const dynamic = "force-dynamic";

const query = z.object({ name: z.string().trim().min(1, "give the file's name").max(255, "at most 255 characters") });
export const POST = route<{ briefingId: string }>("briefings.edit", async ({ req, user, params }) => {
  if (!uuidParam.safeParse(params.briefingId).success) throw new HttpError(400, "briefingId: not a valid id", "briefingId");
  const { name } = parseQuery(req, query);
  const declared = mediaType(req.headers.get("content-type"));
  const tooBig = () => new HttpError(413, `file: larger than the ${HANDOUT_MAX_BYTES / 1024 / 1024} MB limit`, "file");
  const bytes = await readUpload(req, HANDOUT_MAX_BYTES, tooBig);
  if (bytes.length === 0) throw new HttpError(400, "file: the file is empty", "file");
  const actual = sniffHandoutType(bytes.subarray(0, 16));
  if (!actual) throw new HttpError(415, "file: only PDF, PNG and JPEG files can be handouts", "file");
  if (declared !== actual) throw new HttpError(415, `file: the content is ${actual}, not ${declared || "the declared type"}`, "file");
  if (!EXTENSIONS[actual].includes(extensionOf(name)))
    throw new HttpError(415, `name: the file's name does not match its content (${actual})`, "name");
  const saved = await uploadHandout(user, params.briefingId, { fileName: name, contentType: actual, bytes });
  return NextResponse.json(saved, { status: 201 });
});
