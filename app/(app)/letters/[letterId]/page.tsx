import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePagePermission, HttpError } from "@/lib/auth/guard";
import { letterSentTo } from "@/db/access/sponsoring/letters";
import { getSchool } from "@/db/access/shared/school";
import { formatDayTime } from "@/lib/time";

export const metadata: Metadata = { title: "Weekly letter" };
export const dynamic = "force-dynamic";

export default async function LetterPage({ params }: { params: Promise<{ letterId: string }> }) {
  const { letterId } = await params;
  const user = await requirePagePermission("letters.received", `/letters/${letterId}`);
  const letter = await letterSentTo(user, letterId).catch((e: unknown) => {
    if (e instanceof HttpError && e.status === 404) notFound();
    throw e;
  });
  const school = await getSchool(user.schoolId);
  return (
    <div className="max-w-2xl space-y-4">
      <p>
        <Link href="/letters" className="underline">
          All Weekly letters
        </Link>
      </p>
      <h1 className="text-display break-words">{letter.subject}</h1>
      <p className="text-caption text-ink-soft">
        Sent <span className="num">{formatDayTime(new Date(letter.sentAt), school.timeZone)}</span>
      </p>
      <article className="card whitespace-pre-wrap break-words" data-testid="letter-body">
        {letter.text}
      </article>
    </div>
  );
}
