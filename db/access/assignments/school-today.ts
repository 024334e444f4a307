import "server-only";
import type { Transaction } from "sequelize";
import { getSchool } from "../shared/school";
import { now } from "@/lib/clock";
import { dateInZone } from "@/lib/time";

/** Today's calendar date in the school's time zone, from the injectable clock. */
export async function schoolToday(schoolId: string, t?: Transaction): Promise<string> {
  return dateInZone(now(), (await getSchool(schoolId, t)).timeZone);
}
