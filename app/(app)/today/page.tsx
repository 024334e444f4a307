import type { Metadata } from "next";
import { requirePagePermission } from "@/lib/auth/guard";
import { FocusList } from "./_components/focus-list";
import { ChiefToday } from "./_components/chief-today";
import { RecordsToday } from "./_components/records-today";
import { InstructorToday } from "./_components/instructor-today";
import { StudentToday } from "./_components/student-today";
import { SponsorToday } from "./_components/sponsor-today";
import { AttendanceDue } from "./_components/attendance-due";
import { NextSessions } from "./_components/next-sessions";
import { getSchool } from "@/db/access/shared/school";
import { formatInZone } from "@/lib/time";
import { now } from "@/lib/clock";

export const metadata: Metadata = { title: "Today" };
export const dynamic = "force-dynamic";

export default async function TodayPage() {
  const user = await requirePagePermission("today.view", "/today");
  const school = await getSchool(user.schoolId);
  return (
    <div className="space-y-6">
      <header>
        <p className="text-caption font-semibold uppercase tracking-wide text-ink-soft">{school.name}</p>
        <h1 className="text-display">Today</h1>
        <p className="text-ink-soft">{formatInZone(now(), school.timeZone, "EEEE d MMMM yyyy")}</p>
      </header>
      {user.roles.includes("chief") && <ChiefToday user={user} />}
      {user.roles.includes("chief") && <RecordsToday user={user} />}
      {user.roles.includes("instructor") && <InstructorToday user={user} />}
      {user.roles.includes("instructor") && <AttendanceDue user={user} />}
      {user.roles.includes("student") && <StudentToday user={user} />}
      {user.roles.includes("student") && <NextSessions user={user} />}
      {user.roles.includes("sponsor") && <SponsorToday user={user} />}
      <FocusList />
    </div>
  );
}
