import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/guard";
import { practiceReadinessFor } from "@/db/access/practice/readiness";
import { ScrollArea } from "@/components/ui/scroll-area";

/** On a student's record page, for staff with practice.view: practice per item in the last 30 days (never an oral check). */
export async function PracticeReadiness({ user, studentId }: { user: CurrentUser; studentId: string }) {
  if (!can(user, "practice.view")) return null;
  const rows = await practiceReadinessFor(user, studentId);
  return (
    <section className="card" aria-labelledby="practice-readiness">
      <h2 id="practice-readiness">Practice readiness</h2>
      <p className="text-caption text-ink-soft">
        The student&apos;s own practice questions in the last 30 days. Practice is not an oral check and counts for no sign-off.
      </p>
      {rows.length === 0 ? (
        <p className="mt-2 text-ink-soft">No practice in the last 30 days.</p>
      ) : (
        <ScrollArea label="Practice readiness per item (scrolls sideways on small screens)" className="mt-2">
          <table className="data-table" data-testid="practice-readiness">
            <thead>
              <tr>
                <th scope="col">Syllabus item</th>
                <th scope="col">Attempts</th>
                <th scope="col">Right</th>
              </tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.itemId ?? "none"}>
                  <td>{r.itemCode ? `${r.itemCode} ${r.itemTitle}` : "No item (demo only)"}</td>
                  <td className="num">{r.attempts}</td>
                  <td className="num">
                    {r.correct} ({r.percent} %)
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollArea>
      )}
    </section>
  );
}
