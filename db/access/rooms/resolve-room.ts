import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { HttpError } from "@/lib/http/errors";
import { roomKey } from "@/lib/rooms/schema";

/**
 * The room a session is booked in: by `roomId` (an active room of the school), or, for older
 * callers, by a name that matches an active room once normalised ("hangar  classroom " is
 * "Hangar classroom"). Anything else is a 400 naming the field that was given.
 */
export async function resolveRoom(
  schoolId: string,
  given: { roomId?: string | null; room?: string | null },
  t: Transaction,
): Promise<{ id: string; name: string }> {
  if (given.roomId) {
    const [r] = await sequelize.query<{ id: string; name: string; active: boolean }>(
      `SELECT id, name, active FROM rooms WHERE id = :id AND school_id = :s`,
      { replacements: { id: given.roomId, s: schoolId }, type: QueryTypes.SELECT, transaction: t },
    );
    if (!r) throw new HttpError(400, "roomId: no such room at this school", "roomId");
    if (!r.active) throw new HttpError(400, `roomId: ${r.name} is no longer in use; choose another room`, "roomId");
    return { id: r.id, name: r.name };
  }
  const name = given.room ?? "";
  if (!name.trim()) throw new HttpError(400, "roomId: choose a room", "roomId");
  const [r] = await sequelize.query<{ id: string; name: string; active: boolean }>(
    `SELECT id, name, active FROM rooms WHERE school_id = :s AND name_key = :k`,
    { replacements: { s: schoolId, k: roomKey(name) }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!r) throw new HttpError(400, "room: not a room of this school; add it on the Rooms page first", "room");
  if (!r.active) throw new HttpError(400, `room: ${r.name} is no longer in use; choose another room`, "room");
  return { id: r.id, name: r.name };
}
