import type { Metadata } from "next";
import Link from "next/link";
import { Wordmark } from "@/components/wordmark";
import { inspectSetPasswordToken } from "@/db/access/mail/set-password";
import { MAX_PASSWORD_BYTES, MIN_PASSWORD_LENGTH } from "@/lib/auth/password";
import { SetPasswordForm } from "./_components/set-password-form";

export const metadata: Metadata = { title: "Choose your password", referrer: "no-referrer" };
export const dynamic = "force-dynamic";

// Opening the link changes nothing; only submitting the form uses it.
export default async function SetPasswordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const state = await inspectSetPasswordToken(token);
  return (
    <div>
      <Wordmark className="mb-8 text-chalk" />
      <h1 className="mb-2 text-display text-chalk">Choose your password</h1>
      {state.state === "valid" ? (
        <>
          <p className="mb-6 text-chalk-dim">
            For {state.name} ({state.email}). At least {MIN_PASSWORD_LENGTH} characters and at most {MAX_PASSWORD_BYTES} bytes.
          </p>
          <SetPasswordForm token={token} />
        </>
      ) : (
        <div className="rounded-card bg-board-800 p-5">
          <p role="alert" className="mb-4 text-chalk" data-testid="set-password-state">
            {state.state === "used"
              ? "This link has already been used. Sign in with the password you chose."
              : state.state === "expired"
                ? "This link has expired. Ask the school for a new one."
                : "This link is not valid. Check that you copied all of it, or ask the school for a new one."}
          </p>
          <Link href="/sign-in" className="btn inline-flex bg-chalk text-board-900 hover:bg-white">
            Go to sign in
          </Link>
        </div>
      )}
    </div>
  );
}
