"use server";
import { z } from "zod";
import { runAction } from "@/lib/actions/run-action";
import { startWalk } from "@/db/access/records/audit-walks";
import { walkView } from "@/lib/records/audit-walk-view";

/**
 * The chief asks for a full walk of the school's audit chain; the background worker walks it.
 * While a walk is queued or running, that walk is the answer and nothing new is written.
 */
export async function startWalkAction(input: unknown) {
  return runAction("audit.verify", z.object({}).strict(), input ?? {}, async (_data, { user, t }) => {
    const { walk, started } = await startWalk(t, user);
    return { walk: walkView(walk), started };
  });
}
