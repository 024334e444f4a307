import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { getDemo, getDemoRevision } from "@/db/access/curve-lab/demos";
import { ProjectorView } from "../../../_components/projector-view";
import { assignedRevisionFor } from "../../../_lib/student-access";

export const metadata: Metadata = { title: "Projector view · Curve Lab" };
export const dynamic = "force-dynamic";

export default async function ProjectorPage({ params }: { params: Promise<{ demoId: string }> }) {
  const { demoId } = await params;
  const user = await requirePagePermission("demos.view", `/curve-lab/demos/${demoId}/projector`);
  let name: string;
  let spec;
  if (can(user, "demos.edit")) {
    const demo = await getDemo(user.schoolId, demoId);
    if (!demo) notFound();
    name = demo.name;
    spec = demo.revision.spec;
  } else {
    const revisionId = await assignedRevisionFor(user.schoolId, demoId, user.id).catch(() => null);
    const revision = revisionId ? await getDemoRevision(user.schoolId, revisionId) : null;
    if (!revision) notFound();
    name = revision.demoName;
    spec = revision.spec;
  }
  return <ProjectorView name={name} spec={spec} backHref={`/curve-lab/demos/${demoId}`} />;
}
