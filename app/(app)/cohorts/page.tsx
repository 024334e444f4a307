import type { Metadata } from "next";
import { requirePagePermission } from "@/lib/auth/guard";
import { cohortsOverview } from "@/db/access/cohorts/cohorts-overview";
import { getSchool } from "@/db/access/shared/school";
import { dateInZone } from "@/lib/time";
import { CohortsManager } from "./_components/cohorts-manager";

export const metadata: Metadata = { title: "Cohorts" };
export const dynamic = "force-dynamic";

export default async function CohortsPage() {
  const user = await requirePagePermission("cohorts.manage", "/cohorts");
  const [data, school] = await Promise.all([cohortsOverview(user), getSchool(user.schoolId)]);
  return (
    <div className="max-w-5xl space-y-6">
      <div>
        <h1 className="text-display">Cohorts</h1>
        <p className="text-ink-soft">
          A student belongs to one cohort on any date. Moving a student ends the old membership on the move date; the history stays.
        </p>
      </div>
      <CohortsManager {...data} today={dateInZone(new Date(), school.timeZone)} />
    </div>
  );
}
