import "server-only";
import type { Transaction } from "sequelize";
import { getSchool } from "../shared/school";
import type { MailSchool } from "@/lib/mail/compose";

/** The school as mail needs it (name, time zone, sender name), read inside the caller's transaction. */
export async function mailSchool(schoolId: string, t?: Transaction): Promise<MailSchool> {
  const s = await getSchool(schoolId, t);
  return { name: s.name, timeZone: s.timeZone, senderName: s.settings.mailSenderName ?? undefined };
}
