import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { requirePagePermission } from "@/lib/auth/guard";
import { Caution } from "@/components/caution";
import { AXIS_ASSUMPTION } from "@/lib/curve-lab/readouts";
import { getAirframe } from "@/db/access/curve-lab/airframes";
import { AirframeForm } from "../../_components/airframe-form";
import { formValuesFor } from "@/lib/curve-lab/schema";

export const metadata: Metadata = { title: "Edit airframe · Curve Lab" };
export const dynamic = "force-dynamic";

export default async function EditAirframePage({ params }: { params: Promise<{ airframeId: string }> }) {
  const { airframeId } = await params;
  const user = await requirePagePermission("airframes.edit", `/curve-lab/airframes/${airframeId}/edit`);
  const a = z.string().uuid().safeParse(airframeId).success ? await getAirframe(user.schoolId, airframeId) : null;
  if (!a) notFound();
  return (
    <div className="space-y-4">
      <nav aria-label="Breadcrumb" className="text-caption">
        <Link href="/curve-lab">Curve Lab</Link> / <Link href="/curve-lab/airframes">Airframes</Link> /{" "}
        <Link href={`/curve-lab/airframes/${a.id}`}>{a.name}</Link> / Edit
      </nav>
      <h1 className="text-display">Edit {a.name}</h1>
      <Caution />
      <p className="text-caption text-ink-soft">{AXIS_ASSUMPTION}</p>
      <p className="text-caption text-ink-soft">
        Demos already saved keep the numbers they were built with; a change here applies to new demos and to demos you rebuild.
      </p>
      {a.retiredAt ? (
        <p>This profile is retired. Duplicate it to make a changed copy.</p>
      ) : (
        <AirframeForm airframeId={a.id} defaults={formValuesFor(a)} />
      )}
    </div>
  );
}
