import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission } from "@/lib/auth/guard";
import { Caution } from "@/components/caution";
import { AXIS_ASSUMPTION } from "@/lib/curve-lab/readouts";
import { AirframeForm } from "../_components/airframe-form";
import { formValuesFor } from "@/lib/curve-lab/schema";

export const metadata: Metadata = { title: "New airframe · Curve Lab" };
export const dynamic = "force-dynamic";

export default async function NewAirframePage() {
  await requirePagePermission("airframes.edit", "/curve-lab/airframes/new");
  return (
    <div className="space-y-4">
      <nav aria-label="Breadcrumb" className="text-caption">
        <Link href="/curve-lab">Curve Lab</Link> / <Link href="/curve-lab/airframes">Airframes</Link> / New
      </nav>
      <h1 className="text-display">New aircraft profile</h1>
      <Caution />
      <p className="text-caption text-ink-soft">{AXIS_ASSUMPTION}</p>
      <AirframeForm airframeId={null} defaults={formValuesFor(null)} />
    </div>
  );
}
