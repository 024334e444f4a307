"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { createRoom, setRoomActive, updateRoom } from "@/db/access/rooms/save-room";
import { createRoomSchema, setRoomActiveSchema, updateRoomSchema } from "@/lib/rooms/schema";

/** Adds a room to the school's list; a name the school already has (in any spelling) is a 409 naming `name`. */
export async function createRoomAction(input: unknown) {
  const r = await runAction("rooms.manage", createRoomSchema, input, async (data, { user, t }) => createRoom(user, data, t), {
    idempotent: "room.create",
  });
  if (r.ok) revalidatePath("/rooms");
  return r;
}

/** Renames a room and sets its capacity; sessions booked in it show the new name. */
export async function updateRoomAction(input: unknown) {
  const r = await runAction("rooms.manage", updateRoomSchema, input, async (data, { user, t }) => updateRoom(user, data, t));
  if (r.ok) revalidatePath("/rooms");
  return r;
}

/** Takes a room out of use (or back into use). */
export async function setRoomActiveAction(input: unknown) {
  const r = await runAction("rooms.manage", setRoomActiveSchema, input, async (data, { user, t }) => setRoomActive(user, data, t));
  if (r.ok) revalidatePath("/rooms");
  return r;
}
