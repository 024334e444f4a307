import type { Metadata } from "next";
import { requirePagePermission } from "@/lib/auth/guard";
import { retentionList, type RetentionRow } from "@/db/access/retention/records";
import { retentionSettingsFor } from "@/db/access/retention/settings";
import { getSchool } from "@/db/access/shared/school";
import { RETENTION_RULES } from "@/lib/retention/rules";
import { RETENTION_STATE_WORDS, words } from "@/lib/labels";
import { formatDay } from "@/lib/time";
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

function Section({ title, rows, empty, id, tz }: { title: string; rows: RetentionRow[]; empty: string; id: string; tz: string }) {
  return (
    <section aria-labelledby={id} className="space-y-2">
      <h2 id={id}>
        {title} <span className="num text-ink-soft">({rows.length})</span>
      </h2>
      {rows.length === 0 ? (
        <p className="text-ink-soft">{empty}</p>
      ) : (
        <ul className="space-y-2">
          {rows.map((r) => (
            <RecordCard key={r.studentId} r={r} tz={tz} />
          ))}
        </ul>
      )}
    </section>
  );
}

export default async function RetentionPage() {
  const user = await requirePagePermission("retention.manage", "/retention");
  const { saved, ...settings } = await retentionSettingsFor(user.schoolId);
  const { today, rows } = await retentionList(user);
  const tz = (await getSchool(user.schoolId)).timeZone;
  const of = (state: RetentionRow["state"]) => rows.filter((r) => r.state === state);
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
      <Section tz={tz} id="due" title="Ready to archive" rows={of("due")} empty="No record is past its retention date." />
      <Section tz={tz} id="held" title="On legal hold" rows={of("held")} empty="No record is on legal hold." />
      <Section
        tz={tz}
        id="kept"
        title="Kept"
        rows={of("kept")}
        empty="No record of a student who has left is within its retention period."
      />
      <Section tz={tz} id="archived" title="Archived" rows={of("archived")} empty="No record has been marked archived." />
    </div>
  );
}
