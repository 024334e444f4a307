import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { getSchool } from "@/db/access/shared/school";
import { listSessions } from "@/db/access/timetable/list-sessions";
import { timetableFilterChoices } from "@/db/access/timetable/filter-choices";
import { calendarFeedCreatedAt } from "@/db/access/timetable/calendar-feed";
import { weekQuerySchema } from "@/lib/timetable/schema";
import { dateInZone, zonedInstant, formatDay, formatDayTime } from "@/lib/time";
import { now } from "@/lib/clock";
import { TimetableFilters } from "./_components/filters";
import { SessionCard } from "./_components/session-card";
import { CalendarLink } from "./_components/calendar-link";
import { addDaysIso, mondayOf, dayLabel } from "./_components/week";

export const metadata: Metadata = { title: "Timetable" };
export const dynamic = "force-dynamic";

export default async function TimetableWeekPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const user = await requirePagePermission("timetable.view", "/timetable");
  const school = await getSchool(user.schoolId);
  const raw = await searchParams;
  const parsed = weekQuerySchema.safeParse(raw);
  const q = parsed.success ? parsed.data : {};
  const staff = can(user, "timetable.schedule");
  const today = dateInZone(now(), school.timeZone);
  const monday = mondayOf(q.week ?? today);
  const days = Array.from({ length: 7 }, (_, i) => addDaysIso(monday, i));
  const { rows } = await listSessions(user, {
    instructor: q.instructor,
    cohort: q.cohort,
    room: q.room,
    mine: q.mine,
    fromInstant: zonedInstant(monday, "00:00", school.timeZone),
    toInstant: zonedInstant(addDaysIso(monday, 7), "00:00", school.timeZone),
  });
  const choices = staff ? await timetableFilterChoices(user, { cohort: q.cohort, instructor: q.instructor }) : null;
  const feedSince = await calendarFeedCreatedAt(user.id);
  const keep = new URLSearchParams(
    Object.entries({ instructor: q.instructor, cohort: q.cohort, room: q.room, mine: q.mine }).filter((e): e is [string, string] => !!e[1]),
  );
  const weekHref = (d: string) => `/timetable?${new URLSearchParams([...keep, ["week", d]]).toString()}`;
  return (
    <div className="space-y-6">
      <header className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <p className="text-caption font-semibold uppercase tracking-wide text-ink-soft">Week view · times in {school.timeZone}</p>
          <h1 className="text-display">Timetable</h1>
          <p className="text-ink-soft">
            Week of {dayLabel(monday)} to {dayLabel(days[6]!)}
          </p>
        </div>
        <nav aria-label="Timetable views" className="flex flex-wrap gap-2">
          <Link href={weekHref(addDaysIso(monday, -7))} className="btn-quiet">
            Previous week
          </Link>
          <Link href={weekHref(mondayOf(today))} className="btn-quiet">
            This week
          </Link>
          <Link href={weekHref(addDaysIso(monday, 7))} className="btn-quiet">
            Next week
          </Link>
          <Link href={`/timetable/list?${keep.toString()}`} className="btn-quiet">
            List view
          </Link>
          {staff && (
            <Link href="/timetable/new" className="btn-primary">
              Schedule a session
            </Link>
          )}
        </nav>
      </header>
      {!parsed.success && (
        <p role="alert" className="field-error">
          Filter ignored: {parsed.error.issues.map((i) => `${i.path.join(".")} ${i.message}`).join("; ")}.
        </p>
      )}
      {choices && (
        <TimetableFilters
          action="/timetable"
          values={{ ...q }}
          instructors={choices.instructors}
          instructor={choices.instructor}
          cohorts={choices.cohorts}
          cohort={choices.cohort}
          rooms={choices.rooms}
          hidden={{ week: monday }}
        />
      )}
      <section aria-label="Sessions this week" className="grid gap-3 md:grid-cols-7">
        {days.map((d) => {
          const todays = rows.filter((r) => r.date === d);
          return (
            <div
              key={d}
              className={`rounded-card border p-2 ${d === today ? "border-wing-500 bg-white" : "border-paper-edge bg-white/60"}`}
            >
              <h2 className="text-body font-semibold">
                {dayLabel(d)}
                {d === today && <span className="ml-1 text-caption font-normal text-wing-700">(today)</span>}
              </h2>
              {todays.length === 0 ? (
                <p className="mt-1 text-caption text-ink-faint">No sessions</p>
              ) : (
                <ul className="mt-2 space-y-2">
                  {todays.map((s) => (
                    <SessionCard key={s.id} s={s} />
                  ))}
                </ul>
              )}
            </div>
          );
        })}
      </section>
      <p className="text-caption text-ink-soft">
        {rows.length} session{rows.length === 1 ? "" : "s"} this week · shown {formatDayTime(now(), school.timeZone)}
      </p>
      <CalendarLink since={feedSince ? formatDay(feedSince, school.timeZone) : null} />
    </div>
  );
}
