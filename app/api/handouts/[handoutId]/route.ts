// GET /api/handouts/[handoutId]: a handout's file, to people who may read its briefing, as an attachment.
import { route, uuidParam } from "@/lib/http/api";
import { HttpError } from "@/lib/http/errors";
import { getHandoutFile } from "@/db/access/briefings/handouts";
import { fileAttachment } from "../_lib/files";

export const dynamic = "force-dynamic";

export const GET = route<{ handoutId: string }>("briefings.view", async ({ user, params }) => {
  if (!uuidParam.safeParse(params.handoutId).success) throw new HttpError(400, "handoutId: not a valid id", "handoutId");
  const file = await getHandoutFile(user, params.handoutId);
  // out of reach answers exactly as an unknown id does, so the answer does not tell that it exists
  if (file.status !== "ok") throw new HttpError(404, "handoutId: no such handout", "handoutId");
  return fileAttachment(file);
});
