import { z } from "zod";

// The Rooms list's input schemas, shared by the Rooms page's forms and its server actions.

/** A room name as stored: outer spaces trimmed, runs of inner white space made one space. */
export function tidyRoomName(name: string): string {
  return name.replace(/\s+/g, " ").trim();
}

/** The key two spellings of one room share (the database's rooms.name_key is the same expression). */
export function roomKey(name: string): string {
  return tidyRoomName(name).toLowerCase();
}

const uuid = z.string().uuid("not a valid id");
const roomName = z.string().transform(tidyRoomName).pipe(z.string().min(1, "required").max(100, "at most 100 characters"));
/** Seats: optional (empty means not said); otherwise a whole number from 1 to 1000. */
const capacity = z.preprocess(
  (v) => (v === "" || v === null || v === undefined ? null : v),
  z.coerce.number("a whole number").int("a whole number").min(1, "at least 1").max(1000, "at most 1000").nullable(),
);

export const createRoomSchema = z.object({ name: roomName, capacity });
export type CreateRoomOutput = z.output<typeof createRoomSchema>;

export const updateRoomSchema = z.object({ roomId: uuid, name: roomName, capacity });
export type UpdateRoomOutput = z.output<typeof updateRoomSchema>;

export const setRoomActiveSchema = z.object({ roomId: uuid, active: z.boolean("yes or no") });
export type SetRoomActiveOutput = z.output<typeof setRoomActiveSchema>;
