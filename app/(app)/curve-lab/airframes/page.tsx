import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { Caution } from "@/components/caution";
import { AXIS_ASSUMPTION } from "@/lib/curve-lab/readouts";
import { AirframeList } from "./_components/airframe-list";

export const metadata: Metadata = { title: "Airframes · Curve Lab" };
export const dynamic = "force-dynamic";

export default async function AirframesPage() {
  const user = await requirePagePermission("airframes.view", "/curve-lab/airframes");
  return (
    <div className="space-y-4">
      <nav aria-label="Breadcrumb" className="text-caption">
        <Link href="/curve-lab">Curve Lab</Link> / Airframes
      </nav>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-display">Airframes</h1>
        {can(user, "airframes.edit") && (
          <Link href="/curve-lab/airframes/new" className="btn-primary">
            New profile
          </Link>
        )}
      </div>
      <Caution />
      <p className="text-caption text-ink-soft">{AXIS_ASSUMPTION}</p>
      <section className="card" aria-label="Aircraft profiles">
        <AirframeList />
      </section>
    </div>
  );
}
