// GET /api/transfers/credits/[creditId]/evidence: a transfer credit's evidence file, as an attachment (the chief).
import { route, uuidParam } from "@/lib/http/api";
import { HttpError } from "@/lib/http/errors";
import { transferEvidence } from "@/db/access/transfers/credits";
import { contentDisposition } from "@/app/api/handouts/_lib/files";

export const dynamic = "force-dynamic";

export const GET = route<{ creditId: string }>("transfers.manage", async ({ user, params }) => {
  if (!uuidParam.safeParse(params.creditId).success) throw new HttpError(400, "creditId: not a valid id", "creditId");
  const file = await transferEvidence(user, params.creditId);
  if (!file) throw new HttpError(404, "creditId: no such transfer credit", "creditId");
  return new Response(new Uint8Array(file.content), {
    status: 200,
    headers: {
      "Content-Type": file.contentType,
      "Content-Length": String(file.content.length),
      "Content-Disposition": contentDisposition(file.fileName, file.contentType),
      "X-Content-Type-Options": "nosniff",
      "Content-Security-Policy": "sandbox; default-src 'none'",
      "Referrer-Policy": "no-referrer",
      "Cache-Control": "private, no-store",
    },
  });
});
