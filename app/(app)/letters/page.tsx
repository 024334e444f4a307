import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission } from "@/lib/auth/guard";
import { lettersSentTo } from "@/db/access/sponsoring/letters";
import { getSchool } from "@/db/access/shared/school";
import { formatDayTime } from "@/lib/time";

export const metadata: Metadata = { title: "Weekly letters" };
export const dynamic = "force-dynamic";

export default async function LettersPage() {
  const user = await requirePagePermission("letters.received", "/letters");
  const [school, letters] = await Promise.all([getSchool(user.schoolId), lettersSentTo(user)]);
  return (
    <div className="max-w-2xl space-y-4">
      <div>
        <h1 className="text-display">Weekly letters</h1>
        <p className="text-ink-soft">Every Weekly letter sent to you, newest first. Open one to read it again as it was sent.</p>
      </div>
      {letters.length === 0 ? (
        <p className="card">No Weekly letter has been sent to you yet.</p>
      ) : (
        <ul className="card divide-y divide-paper-edge" aria-label="Letters sent to you" data-testid="letter-history">
          {letters.map((l) => (
            <li key={l.id} className="py-3">
              <Link href={`/letters/${l.id}`} className="font-semibold underline break-words">
                {l.subject}
              </Link>
              <p className="text-caption text-ink-soft">
                Sent <span className="num">{formatDayTime(new Date(l.sentAt), school.timeZone)}</span>
              </p>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
