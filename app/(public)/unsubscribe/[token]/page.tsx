import type { Metadata } from "next";
import { Wordmark } from "@/components/wordmark";
import { inspectUnsubscribe, unsubscribeKindLabel } from "@/db/access/mail/unsubscribe";

export const metadata: Metadata = { title: "Stop a mail", referrer: "no-referrer" };
export const dynamic = "force-dynamic";

// Opening this page changes nothing (link scanners follow links); only the button's POST does.
export default async function UnsubscribePage({
  params,
  searchParams,
}: {
  params: Promise<{ token: string }>;
  searchParams: Promise<{ done?: string }>;
}) {
  const { token } = await params;
  const { done } = await searchParams;
  const view = await inspectUnsubscribe(token);
  return (
    <div>
      <Wordmark className="mb-8 text-chalk" />
      <h1 className="mb-4 text-display text-chalk">Stop a mail</h1>
      <div className="rounded-card bg-board-800 p-5">
        {!view ? (
          <p role="alert" className="text-chalk" data-testid="unsubscribe-state">
            This link is not valid. Check that you copied all of it; if it still fails, reply to the school.
          </p>
        ) : view.already || done ? (
          <p role="status" className="text-chalk" data-testid="unsubscribe-state">
            Done: you will no longer receive {unsubscribeKindLabel(view.claim.kind)} about {view.studentFirstName}. The school can turn it
            back on if you ask.
          </p>
        ) : (
          <form method="post" action="/api/unsubscribe">
            <p className="mb-4 text-chalk">
              Stop {unsubscribeKindLabel(view.claim.kind)} about {view.studentFirstName}? Other mail from the school is not affected.
            </p>
            <input type="hidden" name="token" value={token} />
            <button type="submit" className="btn min-h-touch bg-chalk text-board-900 hover:bg-white" data-testid="unsubscribe-confirm">
              Stop {unsubscribeKindLabel(view.claim.kind)}
            </button>
          </form>
        )}
      </div>
    </div>
  );
}
