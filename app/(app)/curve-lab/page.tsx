import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { Caution } from "@/components/caution";
import { AXIS_ASSUMPTION } from "@/lib/curve-lab/readouts";
import { DemoList } from "./_components/demo-list";

export const metadata: Metadata = { title: "Curve Lab" };
export const dynamic = "force-dynamic";

export default async function CurveLabPage() {
  const user = await requirePagePermission("demos.view", "/curve-lab");
  const staff = can(user, "demos.edit");
  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-display">Curve Lab</h1>
        {staff && (
          <div className="flex flex-wrap gap-2">
            <Link href="/curve-lab/airframes" className="btn-quiet">
              Airframes
            </Link>
            <Link href="/curve-lab/demos/new" className="btn-primary">
              New demo
            </Link>
          </div>
        )}
      </div>
      <Caution />
      <p className="text-caption text-ink-soft">{AXIS_ASSUMPTION}</p>
      <section aria-labelledby="demos-h" className="card space-y-3">
        <h2 id="demos-h">{staff ? "Demos" : "Demos assigned to you"}</h2>
        <DemoList staff={staff} />
      </section>
    </div>
  );
}
