import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission } from "@/lib/auth/guard";
import { schedulingChoices } from "@/db/access/timetable/scheduling-choices";
import { getSchool } from "@/db/access/shared/school";
import { dateInZone } from "@/lib/time";
import { now } from "@/lib/clock";
import { ScheduleForm } from "../_components/schedule-form";

export const metadata: Metadata = { title: "Schedule a session" };
export const dynamic = "force-dynamic";

export default async function NewSessionPage() {
  const user = await requirePagePermission("timetable.schedule", "/timetable/new");
  const school = await getSchool(user.schoolId);
  const choices = await schedulingChoices(user);
  return (
    <div className="space-y-6">
      <header>
        <p className="text-caption">
          <Link href="/timetable" className="underline">
            ← Timetable
          </Link>
        </p>
        <h1 className="text-display">Schedule a session</h1>
        <p className="text-ink-soft">Date and time are in the school&apos;s time zone ({school.timeZone}).</p>
      </header>
      {choices.briefings.length === 0 ? (
        <p className="card">There is no briefing to schedule yet. Write one under Briefings first.</p>
      ) : (
        <ScheduleForm
          choices={choices}
          defaults={{
            date: dateInZone(now(), school.timeZone),
            // the caller, when they may teach
            instructorId: choices.self?.id ?? "",
          }}
        />
      )}
    </div>
  );
}
