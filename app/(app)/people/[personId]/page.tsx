import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { can, requirePagePermission } from "@/lib/auth/guard";
import { rolesAllow } from "@/lib/auth/permissions";
import { ROLE_LABELS } from "@/lib/auth/roles";
import { uuidParam } from "@/lib/http/api";
import { now } from "@/lib/clock";
import { dateInZone, formatDay } from "@/lib/time";
import { getPersonInSchool } from "@/db/access/people/list-people";
import { qualificationHistory, schoolCourses } from "@/db/access/people/qualification-reads";
import { getSchool } from "@/db/access/shared/school";
import { ScrollArea } from "@/components/ui/scroll-area";
import { QualificationForm } from "./_components/qualification-form";

export const metadata: Metadata = { title: "Instructor file" };
export const dynamic = "force-dynamic";

export default async function InstructorFilePage({ params }: { params: Promise<{ personId: string }> }) {
  const { personId } = await params;
  const user = await requirePagePermission("people.all", `/people/${personId}`);
  if (!uuidParam.safeParse(personId).success) notFound();
  const person = await getPersonInSchool(user.schoolId, personId);
  if (!person || !rolesAllow(person.roles, "records.sign")) notFound();
  const school = await getSchool(user.schoolId);
  const today = dateInZone(now(), school.timeZone);
  const { versions, courses: grants } = await qualificationHistory(user.schoolId, person.id);
  const courses = await schoolCourses(user.schoolId);
  const current = versions.filter((v) => v.validTo === null);
  const openCourseIds = grants.filter((g) => g.validTo === null).map((g) => g.courseId);
  const manage = can(user, "qualifications.manage");
  return (
    <div className="space-y-6">
      <p className="text-caption">
        <Link href="/people">People</Link>
      </p>
      <h1 className="text-display">Instructor file: {person.name}</h1>
      <p className="text-ink-soft">
        {person.roles.map((r) => ROLE_LABELS[r]).join(", ")} · {person.email}. Every change is kept as a new version with the date it takes
        effect; sign-offs, oral checks and stage checks are judged against the version in force on their day. Nothing here is deleted.
      </p>

      <section className="card" aria-labelledby="in-force">
        <h2 id="in-force">In force now</h2>
        {current.length === 0 && <p className="mt-2">No qualification recorded.</p>}
        {current.map((q) => (
          <div key={q.id} className="mt-3 border-t border-rule pt-3" data-testid="qualification-current">
            <p>
              <strong>{q.certificateKind}</strong> <span className="num">{q.certificateNumber}</span> · version {q.version} since{" "}
              <span className="num">{formatDay(q.validFrom)}</span>
              {q.checkInstructor ? " · designated check instructor" : ""}
            </p>
            <p className="text-caption">
              Ratings: {q.ratings.length ? q.ratings.join(", ") : "none"} · issued {formatDay(q.issuedOn)} · last recency activity{" "}
              {formatDay(q.recencyOn)}, lasting {q.recencyMonths} months
            </p>
            {manage && (
              <details className="mt-2">
                <summary>Record a change to {q.certificateNumber}</summary>
                <div className="mt-3">
                  <QualificationForm
                    personId={person.id}
                    courses={courses}
                    courseIds={openCourseIds}
                    today={today}
                    idPrefix={`q-${q.qualificationId.slice(0, 8)}`}
                    current={{
                      qualificationId: q.qualificationId,
                      certificateKind: q.certificateKind,
                      certificateNumber: q.certificateNumber,
                      ratings: q.ratings,
                      checkInstructor: q.checkInstructor,
                      issuedOn: q.issuedOn,
                      recencyOn: q.recencyOn,
                      recencyMonths: q.recencyMonths,
                    }}
                  />
                </div>
              </details>
            )}
          </div>
        ))}
        <p className="mt-3">
          Courses this instructor may teach:{" "}
          {grants
            .filter((g) => g.validTo === null)
            .map((g) => g.code)
            .join(", ") || "none"}
        </p>
      </section>

      {manage && (
        <section className="card" aria-labelledby="add-qualification">
          <h2 id="add-qualification">Add a qualification</h2>
          <div className="mt-3">
            <QualificationForm
              personId={person.id}
              courses={courses}
              courseIds={openCourseIds}
              today={today}
              idPrefix="new"
              current={null}
            />
          </div>
        </section>
      )}

      <section className="card" aria-labelledby="history">
        <h2 id="history">History</h2>
        <ScrollArea label="Qualification history" className="mt-2">
          <table className="data-table" data-testid="qualification-history">
            <thead>
              <tr>
                <th scope="col">Certificate</th>
                <th scope="col">Version</th>
                <th scope="col">In force</th>
                <th scope="col">Ratings</th>
                <th scope="col">Recency</th>
                <th scope="col">Check instructor</th>
                <th scope="col">Recorded by</th>
                <th scope="col">Note</th>
              </tr>
            </thead>
            <tbody>
              {versions.map((v) => (
                <tr key={v.id}>
                  <td className="num">
                    {v.certificateKind} {v.certificateNumber}
                  </td>
                  <td className="num">{v.version}</td>
                  <td className="num">
                    {formatDay(v.validFrom)} to {v.validTo ? formatDay(v.validTo) : "now"}
                  </td>
                  <td>{v.ratings.join(", ") || "none"}</td>
                  <td className="num">
                    {formatDay(v.recencyOn)} + {v.recencyMonths} months
                  </td>
                  <td>{v.checkInstructor ? "Yes" : "No"}</td>
                  <td>{v.recordedByName ?? "—"}</td>
                  <td>{v.changeNote || "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollArea>
        <h3 className="mt-4">Courses</h3>
        <ScrollArea label="Course history" className="mt-2">
          <table className="data-table" data-testid="course-history">
            <thead>
              <tr>
                <th scope="col">Course</th>
                <th scope="col">From</th>
                <th scope="col">To</th>
                <th scope="col">Recorded by</th>
              </tr>
            </thead>
            <tbody>
              {grants.map((g) => (
                <tr key={`${g.courseId}-${g.validFrom ?? "start"}`}>
                  <td>{g.code}</td>
                  <td className="num">{g.validFrom ? formatDay(g.validFrom) : "first record"}</td>
                  <td className="num">{g.validTo ? formatDay(g.validTo) : "now"}</td>
                  <td>{g.recordedByName ?? "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollArea>
      </section>
    </div>
  );
}
