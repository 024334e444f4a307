import type { Metadata } from "next";
import Link from "next/link";
import { requirePagePermission } from "@/lib/auth/guard";
import { getSchool, DEFAULT_SETTINGS } from "@/db/access/shared/school";
import { practiceTopicsFor } from "@/db/access/practice/topics";
import { practiceHistoryOf } from "@/db/access/practice/attempts";
import { makePracticeQuestion, practiceKinds } from "@/lib/practice/generate";
import type { PracticeTopic } from "@/db/access/practice/topics";
import { formatDay, formatDayTime } from "@/lib/time";
import { Caution } from "@/components/caution";
import { PracticeQuestion, PracticeTest, type ShownQuestion } from "./_components/practice-form";

export const metadata: Metadata = { title: "Practice" };
export const dynamic = "force-dynamic";

const TEST_LENGTH = 5;

function questionFor(topic: PracticeTopic, n: number): ShownQuestion | null {
  const kinds = practiceKinds(topic.snapshot);
  const kind = kinds[n % kinds.length]!;
  const q = makePracticeQuestion(kind, topic.snapshot, Math.random);
  if (!q) return null;
  const item = topic.items.length > 0 ? topic.items[n % topic.items.length]! : null;
  return {
    key: `${topic.demoRevisionId}-${n}`,
    demoRevisionId: topic.demoRevisionId,
    itemId: item?.id ?? null,
    itemLabel: item ? `${item.code} ${item.title}` : null,
    kind,
    inputs: q.inputs,
    text: q.text,
    answerType: q.answer.type,
    unit: q.answer.type === "number" ? q.answer.unit : "",
  };
}

export default async function PracticePage() {
  const user = await requirePagePermission("practice.take", "/practice");
  const school = await getSchool(user.schoolId);
  const topics = await practiceTopicsFor(user.schoolId, user.id);
  const history = await practiceHistoryOf(user, 10);
  const passMark = school.settings.stageCheckPassMarkPercent ?? DEFAULT_SETTINGS.stageCheckPassMarkPercent;
  const knowledgeTestOn = school.settings.knowledgeTestOn ?? null;
  const testQuestions = topics.length
    ? Array.from({ length: TEST_LENGTH }, (_, n) => questionFor(topics[n % topics.length]!, n + 1)).filter(
        (q): q is ShownQuestion => q !== null,
      )
    : [];
  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-display">Practice</h1>
        <p className="text-ink-soft">
          Questions worked out on the aircraft of your own demos, scored at once. Practice is yours: it is never an oral check and never
          goes on your record.
        </p>
      </header>
      <Caution />
      {topics.length === 0 ? (
        <section className="card">
          <p className="text-ink-soft">Nothing to practise yet: questions come from the demos assigned to you.</p>
        </section>
      ) : (
        <>
          <section className="card" aria-labelledby="h-questions">
            <h2 id="h-questions">One question per demo</h2>
            {topics.map((t, i) => {
              const q = questionFor(t, i);
              return (
                <div key={t.demoRevisionId} className="mt-2">
                  <h3 className="text-caption font-semibold text-ink-soft">
                    <Link href={`/curve-lab/demos/${t.demoId}`}>{t.demoName}</Link>
                  </h3>
                  {q ? <PracticeQuestion q={q} /> : <p className="text-ink-soft">No question fits this aircraft.</p>}
                </div>
              );
            })}
          </section>
          <section className="card" aria-labelledby="h-test">
            <h2 id="h-test">Practice test</h2>
            <p className="mt-1 text-ink-soft" data-testid="practice-test-terms">
              {testQuestions.length} questions against the school&apos;s pass mark of {passMark} %.{" "}
              {knowledgeTestOn ? `Your knowledge test is on ${formatDay(knowledgeTestOn)}.` : "No knowledge test date is set yet."}
            </p>
            <div className="mt-2">
              <PracticeTest questions={testQuestions} passMark={passMark} />
            </div>
          </section>
        </>
      )}
      <section className="card" aria-labelledby="h-history">
        <h2 id="h-history">Your recent practice</h2>
        {history.length === 0 ? (
          <p className="mt-1 text-ink-soft">No practice yet.</p>
        ) : (
          <ul className="mt-2 divide-y divide-paper-edge" data-testid="practice-history">
            {history.map((h, i) => (
              <li key={i} className="py-2">
                <p>{h.question}</p>
                <p className="text-caption text-ink-soft">
                  {formatDayTime(new Date(h.answeredAt), school.timeZone)} · {h.correct ? "Right" : "Not right"} · worked answer {h.worked}
                  {h.testId ? " · practice test" : ""}
                </p>
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
