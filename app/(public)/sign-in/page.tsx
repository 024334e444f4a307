import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { getCurrentUser } from "@/lib/auth/session";
import { SignInForm } from "./_components/sign-in-form";
import { Wordmark } from "@/components/wordmark";
import { safeNextPath } from "@/lib/validation/next-path";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ next?: string | string[] }> }) {
  const { next } = await searchParams;
  const safeNext = safeNextPath(next);
  if (await getCurrentUser()) redirect(safeNext);
  return (
    <div>
      <Wordmark className="mb-8 text-chalk" />
      <h1 className="mb-2 text-display text-chalk">Sign in</h1>
      <p className="mb-6 text-chalk-dim">Ground school: briefings, demos, records and progress.</p>
      <SignInForm next={safeNext} />
    </div>
  );
}
