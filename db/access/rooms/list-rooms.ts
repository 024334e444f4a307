import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";

export interface RoomRow {
  id: string;
  name: string;
  capacity: number | null;
  active: boolean;
  /** scheduled sessions from now on */
  upcomingSessions: number;
}

/** The school's rooms, active first, by name. */
export async function listRooms(user: CurrentUser, t?: Transaction): Promise<RoomRow[]> {
  return sequelize.query<RoomRow>(
    `SELECT r.id, r.name, r.capacity, r.active,
            (SELECT count(*) FROM training_sessions s WHERE s.room_id = r.id AND s.status = 'scheduled' AND s.ends_at > now())::int AS "upcomingSessions"
       FROM rooms r WHERE r.school_id = :s ORDER BY r.active DESC, r.name_key`,
    { replacements: { s: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
}
