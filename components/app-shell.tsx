import Link from "next/link";
import { NAV_ITEMS } from "./nav-items";
import { rolesAllow } from "@/lib/auth/permissions";
import { ROLE_LABELS } from "@/lib/auth/roles";
import type { CurrentUser } from "@/lib/auth/session";
import { Wordmark } from "./wordmark";
import { SignOutButton } from "./sign-out-button";

export function AppShell({ user, children }: { user: CurrentUser; children: React.ReactNode }) {
  const items = NAV_ITEMS.filter((i) => rolesAllow(user.roles, i.permission));
  return (
    <div className="min-h-screen">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-white focus:p-2"
      >
        Skip to content
      </a>
      <header className="bg-board-900 text-chalk">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-3">
          <Link href="/today" className="text-chalk no-underline hover:no-underline">
            <Wordmark />
          </Link>
          <nav aria-label="Main" className="flex-1">
            <ul className="flex flex-wrap gap-x-1 gap-y-1">
              {items.map((i) => (
                <li key={i.href}>
                  <Link
                    href={i.href}
                    className="inline-flex min-h-10 items-center rounded-md px-3 text-chalk no-underline hover:bg-board-700 hover:no-underline"
                  >
                    {i.label}
                  </Link>
                </li>
              ))}
            </ul>
          </nav>
          <div className="flex items-center gap-3 text-caption">
            <span data-testid="whoami">
              <span className="font-semibold">{user.name}</span>
              <span className="text-chalk-dim"> · {user.roles.map((r) => ROLE_LABELS[r]).join(", ")}</span>
            </span>
            <SignOutButton />
          </div>
        </div>
      </header>
      <main id="main" className="mx-auto max-w-6xl px-4 py-6">
        {children}
      </main>
    </div>
  );
}
