import type { Metadata } from "next";
import Link from "next/link";
import { z } from "zod";
import { requirePagePermission } from "@/lib/auth/guard";
import { Caution } from "@/components/caution";
import { AXIS_ASSUMPTION } from "@/lib/curve-lab/readouts";
import { defaultSpec } from "@/lib/curve-lab/demo-spec";
import { listAirframes } from "@/db/access/curve-lab/airframes";
import { snapshotOf } from "@/lib/curve-lab/demo-spec";
import { DemoWorkbench } from "../../_components/demo-workbench";

export const metadata: Metadata = { title: "New demo · Curve Lab" };
export const dynamic = "force-dynamic";

export default async function NewDemoPage({ searchParams }: { searchParams: Promise<{ airframe?: string }> }) {
  await requirePagePermission("demos.edit", "/curve-lab/demos/new");
  const user = await requirePagePermission("airframes.view", "/curve-lab/demos/new");
  const airframes = (await listAirframes(user.schoolId)).map(snapshotOf);
  const wanted = z
    .string()
    .uuid()
    .safeParse((await searchParams).airframe);
  const start = (wanted.success ? airframes.find((a) => a.id === wanted.data) : undefined) ?? airframes[0];
  return (
    <div className="space-y-4">
      <nav aria-label="Breadcrumb" className="text-caption">
        <Link href="/curve-lab">Curve Lab</Link> / New demo
      </nav>
      <h1 className="text-display">New demo</h1>
      <Caution />
      <p className="text-caption text-ink-soft">{AXIS_ASSUMPTION}</p>
      {start ? (
        <DemoWorkbench
          mode="builder"
          demoId={null}
          demoRevisionId={null}
          revisionNumber={null}
          name=""
          initialSpec={defaultSpec(start)}
          airframes={airframes}
        />
      ) : (
        <p>
          No aircraft profile yet. <Link href="/curve-lab/airframes/new">Add an airframe</Link> first.
        </p>
      )}
    </div>
  );
}
