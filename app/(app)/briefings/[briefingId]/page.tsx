import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { canViewBriefing } from "@/db/access/briefings/visibility";
import { getBriefing } from "@/db/access/briefings/read-briefing";
import { getSchool } from "@/db/access/shared/school";
import { formatDayTime } from "@/lib/time";
import { uuidParam } from "@/lib/http/api";
import { HandoutUpload } from "../_components/handout-upload";
import { ScrollArea } from "@/components/ui/scroll-area";

export const metadata: Metadata = { title: "Briefing" };
export const dynamic = "force-dynamic";

const KIND: Record<string, string> = { "application/pdf": "PDF", "image/png": "PNG image", "image/jpeg": "JPEG image" };
const size = (n: number) => (n >= 1024 * 1024 ? `${(n / 1024 / 1024).toFixed(1)} MB` : `${Math.max(1, Math.round(n / 1024))} KB`);

export default async function BriefingPage({
  params,
  searchParams,
}: {
  params: Promise<{ briefingId: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const { briefingId } = await params;
  const user = await requirePagePermission("briefings.view", `/briefings/${briefingId}`);
  if (!uuidParam.safeParse(briefingId).success) notFound();
  const rawRev = (await searchParams).revision;
  const revNumber = typeof rawRev === "string" && /^\d{1,6}$/.test(rawRev) ? Number(rawRev) : undefined;
  if (!(await canViewBriefing(user, briefingId))) notFound();
  const b = await getBriefing(user, briefingId, revNumber);
  if (!b) notFound();
  const school = await getSchool(user.schoolId);
  const r = b.revision;
  const total = r.elements.reduce((s, e) => s + e.minutes, 0);
  const isCurrent = r.number === b.currentNumber;
  return (
    <article className="space-y-6" aria-labelledby="briefing-title">
      <header className="space-y-2">
        <p className="text-caption font-semibold uppercase tracking-wide text-ink-soft">
          Briefing · revision {r.number}
          {isCurrent ? " (current)" : ` of ${b.currentNumber}`}
        </p>
        <h1 id="briefing-title" className="text-display">
          {r.title}
        </h1>
        {!isCurrent && (
          <p className="caution" role="note">
            You are reading an earlier revision. <Link href={`/briefings/${b.id}`}>Read the current one (revision {b.currentNumber})</Link>.
          </p>
        )}
        <div className="flex flex-wrap gap-2">
          {can(user, "briefings.edit") && (
            <Link href={`/briefings/${b.id}/edit`} className="btn-primary">
              Edit (makes revision {b.currentNumber + 1})
            </Link>
          )}
          {can(user, "assignments.manage") && (
            <Link href={`/assignments?briefing=${b.id}`} className="btn-quiet">
              Assign to students
            </Link>
          )}
        </div>
      </header>

      <section className="card space-y-3" aria-labelledby="h-objective">
        <h2 id="h-objective">Objective</h2>
        <p className="whitespace-pre-line">{r.objective}</p>
        <h3 className="font-semibold">
          Syllabus items covered{" "}
          <span className="text-caption font-normal text-ink-soft">· syllabus revision {r.syllabusRevisionNumber}</span>
        </h3>
        {b.items.length === 0 ? (
          <p className="text-ink-soft">None named.</p>
        ) : (
          <ul className="space-y-1">
            {b.items.map((i) => (
              <li key={i.id}>
                <span className="num font-semibold">{i.code}</span> {i.title}
              </li>
            ))}
          </ul>
        )}
      </section>

      <section className="card" aria-labelledby="h-elements">
        <h2 id="h-elements">
          Elements{" "}
          <span className="text-caption font-normal text-ink-soft">
            · <span className="num">{total}</span> min in all
          </span>
        </h2>
        <ol className="mt-2 space-y-3 sm:hidden">
          {r.elements.map((e, i) => (
            <li key={i} className="rounded-md border border-paper-edge p-3">
              <p className="font-semibold">
                <span className="num">{i + 1}.</span> {e.title}{" "}
                <span className="text-caption font-normal text-ink-soft">
                  · <span className="num">{e.minutes}</span> min
                </span>
              </p>
              <p className="mt-1 text-caption font-semibold text-ink-soft">Instructor&apos;s actions</p>
              <p className="whitespace-pre-line">{e.instructorActions}</p>
              <p className="mt-1 text-caption font-semibold text-ink-soft">Students&apos; actions</p>
              <p className="whitespace-pre-line">{e.studentActions}</p>
            </li>
          ))}
        </ol>
        <ScrollArea label="Elements table (scrolls sideways on small screens)" className="mt-2 hidden sm:block">
          <table className="data-table">
            <thead>
              <tr>
                <th scope="col">#</th>
                <th scope="col">Element</th>
                <th scope="col">Instructor&apos;s actions</th>
                <th scope="col">Students&apos; actions</th>
                <th scope="col">Min</th>
              </tr>
            </thead>
            <tbody>
              {r.elements.map((e, i) => (
                <tr key={i}>
                  <td className="num">{i + 1}</td>
                  <td className="font-semibold">{e.title}</td>
                  <td className="whitespace-pre-line">{e.instructorActions}</td>
                  <td className="whitespace-pre-line">{e.studentActions}</td>
                  <td className="num">{e.minutes}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollArea>
      </section>

      <div className="grid gap-6 md:grid-cols-2">
        <section className="card space-y-2" aria-labelledby="h-material">
          <h2 id="h-material">Equipment and demos</h2>
          <p className="whitespace-pre-line">{r.equipment || "No equipment listed."}</p>
          {b.demos.length > 0 && (
            <ul className="space-y-1" data-testid="briefing-demos">
              {b.demos.map((d) => (
                <li key={d.demoRevisionId}>
                  <Link href={`/curve-lab/demos/${d.demoId}`}>{d.name}</Link>{" "}
                  <span className="text-caption text-ink-soft">· demo revision {d.revisionNumber}</span>
                </li>
              ))}
            </ul>
          )}
        </section>
        <section className="card space-y-2" aria-labelledby="h-standard">
          <h2 id="h-standard">Completion standard</h2>
          <p className="whitespace-pre-line">{r.completionStandard}</p>
        </section>
      </div>

      <section className="card space-y-3" aria-labelledby="h-handouts">
        <h2 id="h-handouts">Handouts</h2>
        {b.handouts.length === 0 ? (
          <p className="text-ink-soft">No handouts with this revision.</p>
        ) : (
          <ul className="space-y-1" data-testid="handouts">
            {b.handouts.map((h) => (
              <li key={h.id}>
                <a href={`/api/handouts/${h.id}`} download className="inline-flex min-h-touch items-center break-all">
                  {h.fileName}
                </a>{" "}
                <span className="text-caption text-ink-soft">
                  · {KIND[h.contentType]} · {size(h.byteSize)}
                </span>
              </li>
            ))}
          </ul>
        )}
        {can(user, "briefings.edit") && isCurrent && <HandoutUpload briefingId={b.id} />}
      </section>

      <section className="card" aria-labelledby="h-revisions">
        <h2 id="h-revisions">Revisions</h2>
        <ScrollArea label="Revisions table (scrolls sideways on small screens)" className="mt-2">
          <table className="data-table">
            <thead>
              <tr>
                <th scope="col">Revision</th>
                <th scope="col">Made</th>
                <th scope="col">By</th>
                <th scope="col">What changed</th>
              </tr>
            </thead>
            <tbody>
              {b.revisions.map((x) => (
                <tr key={x.number} aria-current={x.number === r.number ? "true" : undefined}>
                  <td className="num">
                    {x.number === r.number ? (
                      <strong>{x.number} (shown)</strong>
                    ) : (
                      <Link href={`/briefings/${b.id}?revision=${x.number}`}>{x.number}</Link>
                    )}
                  </td>
                  <td className="num">{formatDayTime(new Date(x.createdAt), school.timeZone)}</td>
                  <td>{x.createdByName}</td>
                  <td>{x.changeNote || "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollArea>
      </section>
    </article>
  );
}
