import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { Caution } from "@/components/caution";
import { formatSpeed } from "@/lib/curve-lab/demo-spec";
import { flaggedSpeed } from "@/lib/curve-lab/readouts";
import { listAirframes } from "@/db/access/curve-lab/airframes";
import { snapshotOf } from "@/lib/curve-lab/demo-spec";
import { getDemo, getDemoRevision } from "@/db/access/curve-lab/demos";
import { listCallsForDemo } from "@/db/access/curve-lab/calls";
import { ownCallOnRevision } from "@/db/access/curve-lab/call-once";
import { DemoWorkbench } from "../../_components/demo-workbench";
import { assignedRevisionFor } from "../../_lib/student-access";
import { WideTable } from "@/components/ui/wide-table";
import { getSchool } from "@/db/access/shared/school";
import { formatDayTime } from "@/lib/time";

export const metadata: Metadata = { title: "Demo · Curve Lab" };
export const dynamic = "force-dynamic";

const KIND_LABEL = { vmd: "Vmd", stall: "Stall speed", gust: "Speed after a gust" } as const;

export default async function DemoPage({ params }: { params: Promise<{ demoId: string }> }) {
  const { demoId } = await params;
  const user = await requirePagePermission("demos.view", `/curve-lab/demos/${demoId}`);

  if (!can(user, "demos.edit")) {
    // A student opens only a demo assigned to them, at the revision they were given.
    const revisionId = await assignedRevisionFor(user.schoolId, demoId, user.id).catch(() => null);
    const revision = revisionId ? await getDemoRevision(user.schoolId, revisionId) : null;
    if (!revision) notFound();
    // after the reveal a reload shows the result, not a new prompt; earlier calls (other revisions) are listed too
    const [ownCall, ownCalls] = await Promise.all([ownCallOnRevision(user.schoolId, revision.id, user.id), listCallsForDemo(user, demoId)]);
    return (
      <div className="space-y-4">
        <nav aria-label="Breadcrumb" className="text-caption [overflow-wrap:anywhere]">
          <Link href="/curve-lab">Curve Lab</Link> / {revision.demoName}
        </nav>
        <h1 className="text-display [overflow-wrap:anywhere]">{revision.demoName}</h1>
        <Caution />
        <DemoWorkbench
          mode="student"
          demoId={demoId}
          demoRevisionId={revision.id}
          revisionNumber={revision.number}
          name={revision.demoName}
          initialSpec={revision.spec}
          priorCall={ownCall ? { predictedMs: ownCall.predictedMs, actualMs: ownCall.actualMs } : null}
          earlierCalls={ownCalls
            .filter((c) => c.studentId === user.id)
            .map((c) => ({
              id: c.id,
              revisionNumber: c.revisionNumber,
              kind: c.markerKind,
              predictedMs: c.predictedMs,
              actualMs: c.actualMs,
              answerFlag: c.answerFlag,
              createdAt: c.createdAt,
            }))}
        />
      </div>
    );
  }

  const demo = await getDemo(user.schoolId, demoId);
  if (!demo) notFound();
  const airframes = (await listAirframes(user.schoolId)).map(snapshotOf);
  const [calls, school] = await Promise.all([listCallsForDemo(user, demoId), getSchool(user.schoolId)]);
  const canChange = demo.ownerId === user.id || can(user, "demos.manage");
  const unit = demo.revision.spec.axis.unit;
  return (
    <div className="space-y-4">
      <nav aria-label="Breadcrumb" className="text-caption [overflow-wrap:anywhere]">
        <Link href="/curve-lab">Curve Lab</Link> / {demo.name}
      </nav>
      <h1 className="text-display [overflow-wrap:anywhere]">{demo.name}</h1>
      <p className="text-caption text-ink-soft">
        Revision {demo.revision.number} · built by {demo.ownerName}
        {canChange ? "" : " · duplicate it to change your own copy"}
      </p>
      <Caution />
      <DemoWorkbench
        key={demo.revision.id}
        mode="builder"
        demoId={demo.id}
        demoRevisionId={demo.revision.id}
        revisionNumber={demo.revision.number}
        name={demo.name}
        initialSpec={demo.revision.spec}
        airframes={airframes}
        canChange={canChange}
        inUse={demo.inUse}
      />
      <section aria-labelledby="calls-h" className="card space-y-2">
        <h2 id="calls-h">Call it first: students&apos; calls</h2>
        {calls.length === 0 ? (
          <p className="text-ink-soft">No calls from your students yet.</p>
        ) : (
          <WideTable label="Students' calls, scrolls sideways" more={2}>
            <table className="data-table" data-testid="calls-table">
              <thead>
                <tr>
                  <th scope="col">Student</th>
                  <th scope="col">Call</th>
                  <th scope="col">Their call</th>
                  <th scope="col">Answer</th>
                  <th scope="col">Error</th>
                  <th scope="col" data-more="">
                    Revision
                  </th>
                  <th scope="col" data-more="">
                    When
                  </th>
                </tr>
              </thead>
              <tbody>
                {calls.map((c) => (
                  <tr key={c.id}>
                    <td>{c.studentName}</td>
                    <td>{KIND_LABEL[c.markerKind]}</td>
                    <td className="num">
                      {formatSpeed(c.predictedMs, unit)} {c.speedAxis === "true" ? "TAS" : "EAS"}
                    </td>
                    <td className="num">{flaggedSpeed(c.actualMs, unit, c.answerFlag)}</td>
                    <td className="num">
                      {c.errorMs >= 0 ? "+" : "−"}
                      {formatSpeed(Math.abs(c.errorMs), unit)}
                    </td>
                    <td className="num" data-more="">
                      {c.revisionNumber}
                    </td>
                    <td className="num" data-more="">
                      {formatDayTime(new Date(c.createdAt), school.timeZone)}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </WideTable>
        )}
      </section>
    </div>
  );
}
