// POST /api/people/[personId]/unlock: the chief instructor lifts the sign-in lock on an account of their school.
import { NextResponse } from "next/server";
import { route, uuidParam } from "@/lib/http/api";
import { HttpError } from "@/lib/http/errors";
import { unlockAccount } from "@/db/access/people/sign-in-locks";

export const dynamic = "force-dynamic";

export const POST = route<{ personId: string }>("people.unlock", async ({ user, params }) => {
  const id = uuidParam.safeParse(params.personId);
  if (!id.success) throw new HttpError(400, "personId: not a valid id", "personId");
  const unlocked = await unlockAccount(user.schoolId, id.data);
  if (unlocked === 0) throw new HttpError(404, "personId: no lock on that account", "personId");
  return NextResponse.json({ unlocked });
});
