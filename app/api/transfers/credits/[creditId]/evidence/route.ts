// GET /api/transfers/credits/[creditId]/evidence: a transfer credit's evidence file, as an attachment (the chief).
import { route, uuidParam } from "@/lib/http/api";
import { HttpError } from "@/lib/http/errors";
import { transferEvidence } from "@/db/access/transfers/credits";
import { fileAttachment } from "@/app/api/handouts/_lib/files";

export const dynamic = "force-dynamic";

export const GET = route<{ creditId: string }>("transfers.manage", async ({ user, params }) => {
  if (!uuidParam.safeParse(params.creditId).success) throw new HttpError(400, "creditId: not a valid id", "creditId");
  const file = await transferEvidence(user, params.creditId);
  if (!file) throw new HttpError(404, "creditId: no such transfer credit", "creditId");
  return fileAttachment(file);
});
