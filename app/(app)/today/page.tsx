import type { Metadata } from "next";
import { can, requirePagePermission } from "@/lib/auth/guard";
import { FocusList } from "./_components/focus-list";
import { ChiefToday } from "./_components/chief-today";
import { RecordsToday } from "./_components/records-today";
import { InstructorToday } from "./_components/instructor-today";
import { StudentToday } from "./_components/student-today";
import { SponsorToday } from "./_components/sponsor-today";
import { AttendanceDue } from "./_components/attendance-due";
import { NextSessions } from "./_components/next-sessions";
import { getSchool } from "@/db/access/shared/school";
import { todayFocusKind } from "@/db/access/today/focus-list";
import { formatDay } from "@/lib/time";
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
        <p className="text-ink-soft">{formatDay(now(), school.timeZone)}</p>
      </header>
      {can(user, "today.school") && <ChiefToday user={user} />}
      {can(user, "today.school") && <RecordsToday user={user} />}
      {can(user, "today.teaching") && <InstructorToday user={user} />}
      {can(user, "today.teaching") && <AttendanceDue user={user} />}
      {can(user, "today.learning") && <StudentToday user={user} />}
      {can(user, "today.learning") && <NextSessions user={user} />}
      {can(user, "today.sponsoring") && <SponsorToday user={user} />}
      {/* a sponsor's students are listed once, in the panel above */}
      {todayFocusKind(user) !== "sponsoring" && <FocusList />}
    </div>
  );
}
