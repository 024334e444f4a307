"use client";
import { signOut } from "next-auth/react";

export function SignOutButton() {
  return (
    <button
      type="button"
      onClick={() => signOut({ callbackUrl: "/sign-in" })}
      className="min-h-10 rounded-md border border-board-600 px-3 text-chalk hover:bg-board-700"
    >
      Sign out
    </button>
  );
}
