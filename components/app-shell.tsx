import Link from "next/link";
import { NAV_ITEMS, type ShownNavItem } from "./nav-items";
import { rolesAllow } from "@/lib/auth/permissions";
import { ROLE_LABELS } from "@/lib/auth/roles";
import type { CurrentUser } from "@/lib/auth/session";
import { Wordmark } from "./wordmark";
import { SignOutButton } from "./sign-out-button";
import { MainNav } from "./main-nav";

export function AppShell({ user, children }: { user: CurrentUser; children: React.ReactNode }) {
  const items: ShownNavItem[] = NAV_ITEMS.filter((i) => rolesAllow(user.roles, i.permission)).map((i) => ({
    href: i.href,
    label: i.label,
    group: i.group ?? null,
  }));
  const who = (
    <>
      <span className="font-semibold">{user.name}</span>
      <span className="text-chalk-dim"> · {user.roles.map((r) => ROLE_LABELS[r]).join(", ")}</span>
    </>
  );
  return (
    <div className="min-h-screen">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-white focus:p-2"
      >
        Skip to content
      </a>
      <header className="relative bg-board-900 text-chalk print:hidden" data-testid="app-bar">
        <div className="mx-auto flex max-w-6xl items-center gap-x-4 px-4 py-2">
          <Link href="/today" className="shrink-0 text-chalk no-underline hover:no-underline">
            <Wordmark />
          </Link>
          <MainNav items={items} who={who} signOut={<SignOutButton />} />
        </div>
      </header>
      <main id="main" className="mx-auto max-w-6xl px-4 py-6">
        {children}
      </main>
    </div>
  );
}
