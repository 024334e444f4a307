import type { Metadata } from "next";
import { requirePagePermission } from "@/lib/auth/guard";
import { cohortsOverview } from "@/db/access/cohorts/cohorts-overview";
import { getSchool } from "@/db/access/shared/school";
import { parseNameListQuery } from "@/lib/records/student-list-query";
import { dateInZone } from "@/lib/time";
import { ListPageNav, NameFilterForm, QueryProblem } from "@/components/student-pages";
import { CohortsManager } from "./_components/cohorts-manager";

export const metadata: Metadata = { title: "Cohorts" };
export const dynamic = "force-dynamic";

export default async function CohortsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePagePermission("cohorts.manage", "/cohorts");
  const { q, problem } = parseNameListQuery(await searchParams);
  const [{ total, page, pageSize, ...data }, school] = await Promise.all([
    cohortsOverview(user, { name: q.name }, { page: q.page ?? 1 }),
    getSchool(user.schoolId),
  ]);
  return (
    <div className="max-w-5xl space-y-6">
      <div>
        <h1 className="text-display">Cohorts</h1>
        <p className="text-ink-soft">
          A student belongs to one cohort on any date. Moving a student ends the old membership on the move date; the history stays.
        </p>
      </div>
      <NameFilterForm basePath="/cohorts" name={q.name} idPrefix="cohorts" label="Find a cohort" />
      <QueryProblem problem={problem} instead="every cohort" />
      {data.cohorts.length === 0 && (
        <p className="text-ink-soft">{page > 1 ? `No cohorts on page ${page}.` : q.name ? "No cohort matches." : "No cohorts yet."}</p>
      )}
      <ListPageNav
        basePath="/cohorts"
        pairs={q.name ? [["name", q.name]] : []}
        page={page}
        pageSize={pageSize}
        shown={data.cohorts.length}
        total={total}
        label="Cohorts pages"
        testId="cohorts-pages"
        noun="Cohorts"
      />
      <CohortsManager {...data} today={dateInZone(new Date(), school.timeZone)} />
    </div>
  );
}
