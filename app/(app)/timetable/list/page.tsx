import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { timetableFilterChoices } from "@/db/access/timetable/filter-choices";
import { getSchool } from "@/db/access/shared/school";
import { SessionsTable } from "../_components/sessions-table";

export const metadata: Metadata = { title: "Timetable: list" };
export const dynamic = "force-dynamic";

export default async function TimetableListPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const user = await requirePagePermission("timetable.view", "/timetable/list");
  const school = await getSchool(user.schoolId);
  const staff = can(user, "timetable.schedule");
  const raw = await searchParams;
  const initial = Object.fromEntries(Object.entries(raw).filter((e): e is [string, string] => typeof e[1] === "string"));
  const choices = staff
    ? await timetableFilterChoices(user, { cohort: initial.cohort, instructor: initial.instructor })
    : {
        instructors: { kind: "list" as const, rows: [] },
        instructor: null,
        cohorts: { kind: "list" as const, rows: [] },
        cohort: null,
        rooms: [],
      };
  return (
    <div className="space-y-6">
      <header className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <p className="text-caption font-semibold uppercase tracking-wide text-ink-soft">List view · times in {school.timeZone}</p>
          <h1 className="text-display">Timetable</h1>
        </div>
        <nav aria-label="Timetable views" className="flex flex-wrap gap-2">
          <Link href="/timetable" className="btn-quiet">
            Week view
          </Link>
          {staff && (
            <Link href="/timetable/new" className="btn-primary">
              Schedule a session
            </Link>
          )}
        </nav>
      </header>
      <SessionsTable
        staff={staff}
        initial={initial}
        instructors={choices.instructors}
        instructor={choices.instructor}
        cohorts={choices.cohorts}
        cohort={choices.cohort}
        rooms={choices.rooms}
      />
    </div>
  );
}
