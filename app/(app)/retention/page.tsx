import type { Metadata } from "next";
import { requirePagePermission } from "@/lib/auth/guard";
import Link from "next/link";
import { z } from "zod";
import { LISTED_STATES, retentionOverview, type ListedState, type RetentionRow } from "@/db/access/retention/records";
import { retentionSettingsFor } from "@/db/access/retention/settings";
import { getSchool } from "@/db/access/shared/school";
import { RETENTION_RULES } from "@/lib/retention/rules";
import { RETENTION_STATE_WORDS, words } from "@/lib/labels";
import { formatDay } from "@/lib/time";
import { ListPageNav, QueryProblem } from "@/components/student-pages";
import { ArchiveButton, LiftHoldForm, RetentionSettingsForm, SetHoldForm } from "./_components/retention-forms";

export const metadata: Metadata = { title: "Retention" };
export const dynamic = "force-dynamic";

const END_WORDS: Record<string, string> = { graduated: "graduated", terminated: "training terminated", transferred: "transferred out" };

function RecordCard({ r, tz }: { r: RetentionRow; tz: string }) {
  return (
    <li className="card" data-testid={`retention-${r.studentId}`} data-state={r.state}>
      <p className="font-semibold">{r.name}</p>
      <p className="text-caption text-ink-soft break-words">{r.email}</p>
      <p>
        Training ended {r.endedOn ? formatDay(r.endedOn) : "not yet"}
        {r.endKind ? ` (${END_WORDS[r.endKind] ?? r.endKind})` : ""}.{" "}
        {r.keepUntil ? (
          <>
            Kept until {formatDay(r.keepUntil)} ({r.governing.map((g) => RETENTION_RULES[g].source).join(", ")}).
          </>
        ) : (
          "No retention rule applies."
        )}
      </p>
      <p className="text-caption">
        <span className="font-semibold">{words(RETENTION_STATE_WORDS, r.state)}</span>
        {r.hold && (
          <>
            {" "}
            since {formatDay(r.hold.setAt, tz)}, set by {r.hold.setByName}: {r.hold.reason}
          </>
        )}
        {r.archived && (
          <>
            {" "}
            on {formatDay(r.archived.on, tz)} by {r.archived.byName}
          </>
        )}
      </p>
      {r.state === "due" && <ArchiveButton studentId={r.studentId} name={r.name} />}
      {r.hold && <LiftHoldForm holdId={r.hold.id} name={r.name} />}
      {!r.hold && r.state !== "archived" && <SetHoldForm studentId={r.studentId} name={r.name} />}
    </li>
  );
}

const SECTIONS: Record<ListedState, { title: string; empty: string }> = {
  due: { title: "Ready to archive", empty: "No record is past its retention date." },
  held: { title: "On legal hold", empty: "No record is on legal hold." },
  kept: { title: "Kept", empty: "No record of a student who has left is within its retention period." },
  archived: { title: "Archived", empty: "No record has been marked archived." },
};

// ?state= shows one section, 50 a page (?page=); without it each section names its first 20
const querySchema = z
  .object({
    state: z.enum(LISTED_STATES, { message: `must be one of ${LISTED_STATES.join(", ")}` }).optional(),
    page: z.coerce.number().int("must be a whole number").min(1, "must be 1 or more").max(100_000, "must be 100000 or less").optional(),
  })
  .strict();

function Section({
  state,
  rows,
  total,
  tz,
  alone,
}: {
  state: ListedState;
  rows: RetentionRow[];
  total: number;
  tz: string;
  /** the only section shown (paged), not one of the four */
  alone: boolean;
}) {
  const { title, empty } = SECTIONS[state];
  return (
    <section aria-labelledby={state} className="space-y-2">
      <h2 id={state}>
        {title} <span className="num text-ink-soft">({total.toLocaleString("en-GB")})</span>
      </h2>
      {rows.length === 0 ? (
        <p className="text-ink-soft">{total > 0 ? "No records on this page." : empty}</p>
      ) : (
        <ul className="space-y-2">
          {rows.map((r) => (
            <RecordCard key={r.studentId} r={r} tz={tz} />
          ))}
        </ul>
      )}
      {!alone && total > rows.length && (
        <p>
          <Link href={`/retention?state=${state}`}>
            The first {rows.length} by name are shown: see all {total.toLocaleString("en-GB")} {title.toLowerCase()}
          </Link>
        </p>
      )}
    </section>
  );
}

export default async function RetentionPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePagePermission("retention.manage", "/retention");
  const raw = Object.fromEntries(Object.entries(await searchParams).filter(([, v]) => typeof v === "string" && v !== ""));
  const parsed = querySchema.safeParse(raw);
  const q = parsed.success ? parsed.data : {};
  const problem = parsed.success ? null : (parsed.error.issues[0] ?? null);
  const [{ saved, ...settings }, overview, school] = await Promise.all([
    retentionSettingsFor(user.schoolId),
    retentionOverview(user, { state: q.state, page: q.page }),
    getSchool(user.schoolId),
  ]);
  const { today, counts, sections, state, page, pageSize } = overview;
  const tz = school.timeZone;
  return (
    <div className="max-w-3xl space-y-6">
      <div>
        <h1 className="text-display">Retention of records</h1>
        <p className="text-ink-soft">
          Each student&apos;s record is kept from the end of training for the longest period of the rules that apply, and for as long as a
          legal hold is in force. Nothing is ever deleted: once a record is past its date it is listed here, and marking it archived is a
          step you take. Today is {formatDay(today)}.{saved ? "" : " The rules below are the defaults until you save them."}
        </p>
      </div>
      <RetentionSettingsForm settings={settings} />
      <QueryProblem problem={problem} instead="every section" />
      {state ? (
        <>
          <p>
            <Link href="/retention">All four sections</Link>
          </p>
          <ListPageNav
            basePath="/retention"
            pairs={[["state", state]]}
            page={page}
            pageSize={pageSize}
            shown={sections[state].length}
            total={counts[state]}
            label={`${SECTIONS[state].title} pages`}
            testId="retention-pages"
            noun="Records"
          />
          <Section tz={tz} state={state} rows={sections[state]} total={counts[state]} alone />
        </>
      ) : (
        LISTED_STATES.map((k) => <Section key={k} tz={tz} state={k} rows={sections[k]} total={counts[k]} alone={false} />)
      )}
    </div>
  );
}
