import type { Metadata } from "next";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { uuidParam } from "@/lib/http/api";
import { activeEnrolment } from "@/db/access/shared/enrolment";
import { groundHoursFor } from "@/db/access/ground-log/ground-hours";
import { logbookFor } from "@/db/access/ground-log/logbook";
import { groundLogStudentName, groundLogStudentsPage, mayViewGroundLog } from "@/db/access/ground-log/visible-students";
import { listMakeupFor } from "@/db/access/ground-log/list-makeup";
import { listSessions } from "@/db/access/timetable/list-sessions";
import { getSchool } from "@/db/access/shared/school";
import { hoursLabel, formatDay } from "@/lib/time";
import { now } from "@/lib/clock";
import { ATTENDANCE_LABELS } from "@/lib/timetable/schema";
import { MakeupActions } from "./_components/makeup-actions";
import { PrintButton } from "./_components/print-button";
import { MAKEUP_STATE_WORDS } from "@/lib/labels";
import { ScrollArea } from "@/components/ui/scroll-area";
import { WideTable } from "@/components/ui/wide-table";
import { StudentFilterForm, StudentPageNav, isFiltered, noStudentsWords } from "@/components/student-pages";
import { parseStudentListQuery } from "@/lib/records/student-list-query";
import { fieldLabel } from "@/lib/validation/messages";

export const metadata: Metadata = { title: "Ground log" };
export const dynamic = "force-dynamic";

const STATE_LABEL = MAKEUP_STATE_WORDS;
const CLOSED_BY = {
  session: "by a later session",
  one_to_one: "by a one-to-one briefing",
  oral_check: "by self-study and an oral check",
  attendance_amended: "attendance corrected",
} as Record<string, string>;

export default async function GroundLogPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePagePermission("groundlog.view", "/ground-log");
  const school = await getSchool(user.schoolId);
  const sp = await searchParams;
  // a student (who records no attendance) sees only their own Ground log: no student picker
  const isStudent = can(user, "students.own") && !can(user, "attendance.record");
  // the students to choose from, one page at a time (filtered by name and cohort) like Records
  const { q, problem, filter } = parseStudentListQuery(sp, ["student"]);
  const listProblem = isStudent ? null : problem;
  const list = isStudent ? null : await groundLogStudentsPage(user, filter, { page: q.page ?? 1 });
  const choices = list?.rows ?? [];
  const paged = list !== null && (list.total > list.pageSize || list.page > 1 || isFiltered(q) || listProblem !== null);
  const listPairs: [string, string][] = [
    ...(q.name ? ([["name", q.name]] as [string, string][]) : []),
    ...(q.cohort ? ([["cohort", q.cohort]] as [string, string][]) : []),
    ...(q.page && q.page > 1 ? ([["page", String(q.page)]] as [string, string][]) : []),
  ];
  const asked = typeof sp.student === "string" ? sp.student : undefined;
  const badParam = asked !== undefined && !uuidParam.safeParse(asked).success;
  const studentId = isStudent ? user.id : !badParam && asked ? asked : choices[0]?.id;
  const allowed = studentId ? await mayViewGroundLog(user, studentId) : false;
  const listed = choices.find((c) => c.id === studentId);
  const otherName = allowed && studentId && !isStudent && !listed ? await groundLogStudentName(user, studentId) : null;
  const student =
    allowed && studentId
      ? isStudent
        ? { id: user.id, name: user.name }
        : listed
          ? { id: listed.id, name: listed.name }
          : otherName
            ? { id: studentId, name: otherName }
            : null
      : null;
  const enrolment = student ? await activeEnrolment(user.schoolId, student.id) : null;
  const hours = student && enrolment ? await groundHoursFor(student.id, enrolment.courseId) : null;
  const log = student ? await logbookFor(user.schoolId, student.id) : [];
  const makeup = student ? await listMakeupFor([student.id]) : [];
  const staff = can(user, "attendance.record");
  // the student's record page (where each oral check has its anchor) is open to those who record checks
  const canOpenRecord = can(user, "checks.record");
  const upcoming =
    staff && student && makeup.some((m) => m.state === "open")
      ? (await listSessions(user, { attendee: student.id, status: "scheduled", fromInstant: now() }, { pageSize: 20 })).rows
      : [];
  return (
    <div className="space-y-6">
      <style>{`@media print { header:has(nav[aria-label="Main"]), a[href="#main"], .no-print { display: none !important; } .card { box-shadow: none; border: 0; break-inside: avoid; } .wide-table [data-more]:not(.no-print) { display: table-cell !important; } .wide-table > button { display: none !important; } }`}</style>
      <header>
        <h1 className="text-display">Ground log</h1>
        <p className="text-ink-soft">
          {student ? `${student.name}${enrolment ? ` · ${enrolment.courseTitle}` : ""}` : "Ground-training records"}
        </p>
      </header>
      {list && paged && (
        <div className="no-print">
          <StudentFilterForm
            basePath="/ground-log"
            q={q}
            cohorts={list.cohorts}
            idPrefix="gl-find"
            submitLabel="Find"
            keep={student ? [["student", student.id]] : []}
          />
        </div>
      )}
      {listProblem && (
        <p role="alert" className="field-error no-print">
          {fieldLabel(listProblem.path)}: {listProblem.message}. Showing every student instead.
        </p>
      )}
      {list && paged && choices.length === 0 && <p className="no-print text-ink-soft">{noStudentsWords(q, list.page)}</p>}
      {!isStudent && choices.length > 0 && (
        <form method="get" className="card no-print flex flex-wrap items-end gap-3" aria-label="Choose a student">
          {listPairs.map(([k, v]) => (
            <input key={k} type="hidden" name={k} value={v} />
          ))}
          <div className="min-w-60 flex-1">
            <label htmlFor="gl-student" className="field-label">
              Student
            </label>
            <select id="gl-student" name="student" defaultValue={student?.id ?? ""} className="field-input">
              {student && !listed && <option value={student.id}>{student.name}</option>}
              {choices.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.name}
                  {c.cohortName ? ` (${c.cohortName})` : ""}
                </option>
              ))}
            </select>
          </div>
          <button type="submit" className="btn-quiet">
            Show
          </button>
          {list && (
            <div className="w-full">
              <StudentPageNav
                basePath="/ground-log"
                q={q}
                page={list.page}
                pageSize={list.pageSize}
                shown={choices.length}
                total={list.total}
                label="Student list pages"
                testId="ground-log-student-pages"
                keep={student ? [["student", student.id]] : []}
              />
            </div>
          )}
        </form>
      )}
      {badParam && (
        <p role="alert" className="field-error">
          student: not a valid id.
        </p>
      )}
      {!student && !(list && choices.length === 0 && (isFiltered(q) || list.page > 1)) && (
        <p className="card">
          {list && list.total === 0 && !isFiltered(q) && !isStudent
            ? "No student's Ground log is shared with you."
            : "No such student, or not one whose Ground log you may see."}
        </p>
      )}
      {student && (
        <>
          <section className="card" aria-labelledby="hours-title">
            <h2 id="hours-title">Ground hours</h2>
            {hours ? (
              <>
                <p className="num mt-1 text-title" data-testid="ground-log-hours">
                  {hoursLabel(hours.creditedMinutes, hours.minimumMinutes)}
                </p>
                <p className="text-caption text-ink-soft">{hours.courseCode}: credited time only, against the course minimum.</p>
                <div className="mt-3">
                  <WideTable label="Hours per stage, scrolls sideways" more={0}>
                    <table className="data-table">
                      <caption className="sr-only">Credited hours per stage</caption>
                      <thead>
                        <tr>
                          <th scope="col">Stage</th>
                          <th scope="col" className="text-right">
                            Credited
                          </th>
                        </tr>
                      </thead>
                      <tbody>
                        {hours.byStage.map((st) => (
                          <tr key={`${st.stageCode ?? "none"}:${st.stageTitle}`}>
                            <td>
                              {st.stageCode ? `${st.stageCode} · ` : ""}
                              {st.stageTitle}
                            </td>
                            <td className="num text-right">{hoursLabel(st.minutes)}</td>
                          </tr>
                        ))}
                        {hours.byStage.length === 0 && (
                          <tr>
                            <td colSpan={2} className="text-ink-soft">
                              No credited time yet.
                            </td>
                          </tr>
                        )}
                      </tbody>
                    </table>
                  </WideTable>
                </div>
              </>
            ) : (
              <p className="mt-1 text-ink-soft">Not enrolled on a course at the moment.</p>
            )}
          </section>
          <section className="card" aria-labelledby="logbook-title">
            <div className="flex flex-wrap items-center justify-between gap-2">
              <h2 id="logbook-title">Logbook</h2>
              <div className="no-print flex flex-wrap gap-2">
                <PrintButton />
                <a className="btn-quiet" href={`/api/ground-log/${student.id}/logbook`} download>
                  Download CSV
                </a>
              </div>
            </div>
            <ol className="mt-2 divide-y divide-paper-edge sm:hidden print:hidden" aria-label="Logbook lines">
              {log.map((l) => (
                <li key={l.entryId} className="py-2">
                  <p className="flex justify-between gap-2">
                    <span className="num font-semibold">{formatDay(l.date)}</span>
                    <span className="num">
                      {hoursLabel(l.durationMinutes)} · {ATTENDANCE_LABELS[l.status]}
                    </span>
                  </p>
                  <p>{l.subjects}</p>
                  <p className="text-caption text-ink-soft">
                    {l.instructorName}, certificate <span className="num">{l.certificateNumber ?? "—"}</span>
                    {l.amended ? ` · amended: ${l.reason}` : ""}
                  </p>
                </li>
              ))}
              {log.length === 0 && <li className="py-2 text-ink-soft">No entries yet.</li>}
            </ol>
            <ScrollArea label="Logbook lines, scrolls sideways" className="mt-2 hidden sm:block print:block print:overflow-visible">
              <table className="data-table" data-testid="logbook">
                <caption className="sr-only">Logbook lines, one per ground-training entry</caption>
                <thead>
                  <tr>
                    <th scope="col">Date</th>
                    <th scope="col" className="text-right">
                      Duration
                    </th>
                    <th scope="col">Attendance</th>
                    <th scope="col">Subjects</th>
                    <th scope="col">Instructor</th>
                    <th scope="col">Certificate</th>
                  </tr>
                </thead>
                <tbody>
                  {log.map((l) => (
                    <tr key={l.entryId}>
                      <td className="num whitespace-nowrap">{formatDay(l.date)}</td>
                      <td className="num text-right whitespace-nowrap">{hoursLabel(l.durationMinutes)}</td>
                      <td>
                        {ATTENDANCE_LABELS[l.status]}
                        {l.amended ? <span className="block text-caption text-ink-soft">amended: {l.reason}</span> : null}
                      </td>
                      <td>{l.subjects}</td>
                      <td>{l.instructorName}</td>
                      <td className="num">{l.certificateNumber ?? "—"}</td>
                    </tr>
                  ))}
                  {log.length === 0 && (
                    <tr>
                      <td colSpan={6} className="text-ink-soft">
                        No entries yet.
                      </td>
                    </tr>
                  )}
                </tbody>
              </table>
            </ScrollArea>
            <p className="mt-2 text-caption text-ink-soft">
              Printed from {school.name}. Entries are never edited: a correction is an amendment and the original stays on record.
            </p>
          </section>
          <section className="card" aria-labelledby="makeup-title">
            <h2 id="makeup-title">Make-up items</h2>
            {makeup.length === 0 ? (
              <p className="mt-1 text-ink-soft">None: nothing missed.</p>
            ) : (
              <div className="mt-2">
                <WideTable label="Make-up items, scrolls sideways" more={staff ? 2 : 1}>
                  <table className="data-table" data-testid="makeup">
                    <thead>
                      <tr>
                        <th scope="col">Syllabus item</th>
                        <th scope="col">State</th>
                        <th scope="col" data-more="">
                          Missed
                        </th>
                        {staff && (
                          <th scope="col" className="no-print" data-more="">
                            Action
                          </th>
                        )}
                      </tr>
                    </thead>
                    <tbody>
                      {makeup.map((m) => (
                        <tr key={m.id}>
                          <td>
                            {m.itemCode} {m.itemTitle}
                          </td>
                          <td>
                            <span className="font-semibold">{STATE_LABEL[m.state]}</span>
                            {m.closedByKind === "oral_check" && m.closedById && m.closedByCheckAt ? (
                              <span className="block text-caption text-ink-soft" data-testid="makeup-closed-by-check">
                                {"Closed by "}
                                {canOpenRecord ? (
                                  <a className="underline" href={`/records/${m.studentId}#check-${m.closedById}`}>
                                    the oral check of {formatDay(new Date(m.closedByCheckAt), school.timeZone)}
                                  </a>
                                ) : (
                                  <>the oral check of {formatDay(new Date(m.closedByCheckAt), school.timeZone)}</>
                                )}
                                {m.note ? `: ${m.note}` : ""}
                              </span>
                            ) : (
                              m.closedByKind && (
                                <span className="block text-caption text-ink-soft">
                                  {CLOSED_BY[m.closedByKind] ?? m.closedByKind}
                                  {m.note ? `: ${m.note}` : ""}
                                </span>
                              )
                            )}
                            {m.waivedReason && <span className="block text-caption text-ink-soft">{m.waivedReason}</span>}
                          </td>
                          <td data-more="">
                            {m.sourceTitle ?? m.sourceKind}
                            {m.sourceStartsAt ? (
                              <span className="num block text-caption text-ink-soft">
                                {formatDay(new Date(m.sourceStartsAt), school.timeZone)}
                              </span>
                            ) : null}
                          </td>
                          {staff && (
                            <td className="no-print" data-more="">
                              {(m.state === "open" || m.state === "scheduled") && (
                                <MakeupActions
                                  itemId={m.id}
                                  state={m.state}
                                  canWaive={can(user, "makeup.waive")}
                                  sessions={upcoming.map((s) => ({
                                    id: s.id,
                                    label: `${formatDay(s.date)} ${s.startLocal} ${s.briefingTitle}`,
                                  }))}
                                />
                              )}
                            </td>
                          )}
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </WideTable>
              </div>
            )}
          </section>
        </>
      )}
    </div>
  );
}
