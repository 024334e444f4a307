// Rooms of the seeded school (db/seed/timetable.ts), by name.
export const ROOMS_LOOKUPS: Record<string, { sql: string; params?: unknown[] }> = {
  hangarRoom: {
    sql: `SELECT r.id FROM rooms r JOIN schools s ON s.id = r.school_id WHERE s.name = $1 AND r.name = $2`,
    params: ["Larkhollow Flying School", "Hangar classroom"],
  },
};
