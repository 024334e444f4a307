import { listSponsoredStudents } from "@/db/access/cohorts/sponsor-links";
import { getActiveEnrolment } from "@/db/access/cohorts/student-enrolment";
import { creditedMinutesFor } from "@/db/access/ground-log/ground-hours";
import type { CurrentUser } from "@/lib/auth/session";
import { hoursLabel } from "@/lib/time";

export async function SponsorToday({ user }: { user: CurrentUser }) {
  const students = await listSponsoredStudents(user.id);
  const rows = await Promise.all(
    students.map(async (s) => {
      const e = await getActiveEnrolment(s.studentId);
      const minutes = e && s.sharesHours ? await creditedMinutesFor(s.studentId, e.courseId) : null;
      return {
        ...s,
        course: e?.courseTitle ?? "Not enrolled",
        hours: e && minutes !== null ? hoursLabel(minutes, e.minGroundMinutes) : "Not shared",
      };
    }),
  );
  return (
    <section className="card" aria-labelledby="sponsored-title">
      <h2 id="sponsored-title">Progress of the students you sponsor</h2>
      <table className="data-table mt-2">
        <thead>
          <tr>
            <th scope="col">Student</th>
            <th scope="col">Course</th>
            <th scope="col">Ground hours</th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.studentId}>
              <td>{r.name}</td>
              <td>{r.course}</td>
              <td className="num">{r.hours}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}
