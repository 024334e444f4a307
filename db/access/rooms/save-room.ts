import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { HttpError } from "@/lib/http/errors";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";
import type { CreateRoomOutput, SetRoomActiveOutput, UpdateRoomOutput } from "@/lib/rooms/schema";

function requireManager(user: CurrentUser) {
  if (!can(user, "rooms.manage")) throw new HttpError(403, "You may not manage rooms");
}

/** The unique-name refusal (rooms_school_name_unique) as a 409 naming the field; anything else is rethrown. */
async function guardName<T>(t: Transaction, name: string, fn: (sp: Transaction) => Promise<T>): Promise<T> {
  try {
    return await sequelize.transaction({ transaction: t }, fn);
  } catch (e) {
    const pe = (e as { parent?: { code?: string; constraint?: string } }).parent;
    if (pe?.code === "23505" && pe.constraint === "rooms_school_name_unique")
      throw new HttpError(409, `name: the school already has a room called ${name}`, "name");
    throw e;
  }
}

export async function createRoom(user: CurrentUser, input: CreateRoomOutput, t: Transaction) {
  requireManager(user);
  return guardName(t, input.name, async (sp) => {
    const [row] = await sequelize.query<{ id: string; name: string }>(
      `INSERT INTO rooms (school_id, name, capacity) VALUES (:s, :n, :c) RETURNING id, name`,
      { replacements: { s: user.schoolId, n: input.name, c: input.capacity }, type: QueryTypes.SELECT, transaction: sp },
    );
    return row!;
  });
}

/** Renames a room and sets its capacity; the Timetable's copies of the name follow (trigger of 0560). */
export async function updateRoom(user: CurrentUser, input: UpdateRoomOutput, t: Transaction) {
  requireManager(user);
  return guardName(t, input.name, async (sp) => {
    const [row] = await sequelize.query<{ id: string; name: string }>(
      `UPDATE rooms SET name = :n, capacity = :c, updated_at = now() WHERE id = :id AND school_id = :s RETURNING id, name`,
      { replacements: { id: input.roomId, s: user.schoolId, n: input.name, c: input.capacity }, type: QueryTypes.SELECT, transaction: sp },
    );
    if (!row) throw new HttpError(404, "roomId: no such room at this school", "roomId");
    return row;
  });
}

/** Takes a room out of use (or back): it leaves the scheduling forms; sessions already booked keep it. */
export async function setRoomActive(user: CurrentUser, input: SetRoomActiveOutput, t: Transaction) {
  requireManager(user);
  const [row] = await sequelize.query<{ id: string; active: boolean }>(
    `UPDATE rooms SET active = :a, updated_at = now() WHERE id = :id AND school_id = :s RETURNING id, active`,
    { replacements: { id: input.roomId, s: user.schoolId, a: input.active }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!row) throw new HttpError(404, "roomId: no such room at this school", "roomId");
  return row;
}
