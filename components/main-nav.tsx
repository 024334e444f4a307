"use client";
// The browser half of the shell's navigation. Below 1024 px: one bar with a menu button that opens
// the whole link list over the page (no layout shift). From 1024 px: one row; when a caller has more
// than FLAT_NAV_LIMIT links they are grouped into small disclosure menus. The current page carries
// aria-current="page" and a visible bar under it (not colour alone). Menus close on navigation,
// on Escape (focus returns to their button) and on a click outside.
import Link from "next/link";
import { usePathname } from "next/navigation";
import { useEffect, useId, useRef, useState } from "react";
import { FLAT_NAV_LIMIT, NAV_GROUPS, currentNavHref, type NavGroup, type ShownNavItem } from "./nav-items";

const LINK =
  "inline-flex min-h-10 items-center rounded-md px-3 text-chalk no-underline hover:bg-board-700 hover:no-underline border-b-4 border-transparent";
const CURRENT = "!border-chalk font-semibold";

function NavLink({ item, current, onPick, block = false }: { item: ShownNavItem; current: boolean; onPick?: () => void; block?: boolean }) {
  return (
    <Link
      href={item.href}
      aria-current={current ? "page" : undefined}
      onClick={onPick}
      className={`${LINK} ${block ? "w-full" : ""} ${current ? CURRENT : ""}`}
    >
      {item.label}
    </Link>
  );
}

interface Section {
  group: NavGroup | null;
  items: ShownNavItem[];
}

/** Ungrouped links first (Today), then each group in its order. */
function sections(items: ShownNavItem[]): Section[] {
  const out: Section[] = [{ group: null, items: items.filter((i) => !i.group) }];
  for (const g of NAV_GROUPS) out.push({ group: g, items: items.filter((i) => i.group === g) });
  return out.filter((s) => s.items.length > 0);
}

/** Closes on Escape (returning focus to the button) and on a pointer press outside the box. */
function useDismiss(
  open: boolean,
  close: () => void,
  box: React.RefObject<HTMLElement | null>,
  button: React.RefObject<HTMLElement | null>,
) {
  useEffect(() => {
    if (!open) return;
    const onKey = (e: KeyboardEvent) => {
      if (e.key === "Escape") {
        close();
        button.current?.focus();
      }
    };
    const onDown = (e: PointerEvent) => {
      if (box.current && !box.current.contains(e.target as Node)) close();
    };
    document.addEventListener("keydown", onKey);
    document.addEventListener("pointerdown", onDown);
    return () => {
      document.removeEventListener("keydown", onKey);
      document.removeEventListener("pointerdown", onDown);
    };
  }, [open, close, box, button]);
}

function Chevron({ open }: { open: boolean }) {
  return (
    <svg width="12" height="12" viewBox="0 0 12 12" aria-hidden="true" focusable="false" className={open ? "rotate-180" : ""}>
      <path d="M2 4 L6 8 L10 4" stroke="currentColor" strokeWidth="2" fill="none" strokeLinecap="round" />
    </svg>
  );
}

function GroupMenu({
  group,
  items,
  current,
  pathname,
}: {
  group: NavGroup;
  items: ShownNavItem[];
  current: string | null;
  pathname: string;
}) {
  // open only on the page it was opened on: navigating closes it
  const [openAt, setOpenAt] = useState<string | null>(null);
  const open = openAt === pathname;
  const setOpen = (o: boolean) => setOpenAt(o ? pathname : null);
  const id = useId();
  const box = useRef<HTMLLIElement>(null);
  const button = useRef<HTMLButtonElement>(null);
  const holdsCurrent = items.some((i) => i.href === current);
  useDismiss(open, () => setOpenAt(null), box, button);
  return (
    <li ref={box} className="relative">
      <button
        ref={button}
        type="button"
        aria-expanded={open}
        aria-controls={id}
        onClick={() => setOpen(!open)}
        className={`${LINK} gap-1.5 ${holdsCurrent ? CURRENT : ""}`}
      >
        {group}
        <Chevron open={open} />
      </button>
      <ul id={id} hidden={!open} className="absolute left-0 top-full z-40 mt-1 min-w-52 rounded-md bg-board-800 p-1 shadow-lg">
        {items.map((i) => (
          <li key={i.href}>
            <NavLink item={i} current={i.href === current} onPick={() => setOpen(false)} block />
          </li>
        ))}
      </ul>
    </li>
  );
}

export function MainNav({ items, who, signOut }: { items: ShownNavItem[]; who: React.ReactNode; signOut: React.ReactNode }) {
  const pathname = usePathname() ?? "";
  const current = currentNavHref(items, pathname);
  // open only on the page it was opened on: navigating closes it
  const [openAt, setOpenAt] = useState<string | null>(null);
  const open = openAt === pathname;
  const close = () => setOpenAt(null);
  const box = useRef<HTMLDivElement>(null);
  const button = useRef<HTMLButtonElement>(null);
  useDismiss(open, close, box, button);
  const grouped = items.length > FLAT_NAV_LIMIT;
  const parts = sections(items);

  return (
    <>
      {/* wide screens: one row */}
      <nav aria-label="Main" className="hidden flex-1 lg:block">
        <ul className="flex items-center gap-x-1">
          {grouped
            ? parts.map((s) =>
                s.group && s.items.length > 1 ? (
                  <GroupMenu key={s.group} group={s.group} items={s.items} current={current} pathname={pathname} />
                ) : (
                  s.items.map((i) => (
                    <li key={i.href}>
                      <NavLink item={i} current={i.href === current} />
                    </li>
                  ))
                ),
              )
            : items.map((i) => (
                <li key={i.href}>
                  <NavLink item={i} current={i.href === current} />
                </li>
              ))}
        </ul>
      </nav>
      <div className="hidden items-center gap-3 text-caption lg:flex">
        <span data-testid="whoami">{who}</span>
        {signOut}
      </div>

      {/* phones and tablets: one bar, a menu button, the list over the page */}
      <div ref={box} className="ml-auto lg:hidden">
        <button
          ref={button}
          type="button"
          aria-expanded={open}
          aria-controls="main-menu"
          onClick={() => setOpenAt(open ? null : pathname)}
          className="inline-flex min-h-touch items-center gap-2 rounded-md border border-board-600 px-3 text-chalk hover:bg-board-700"
        >
          <svg width="18" height="14" viewBox="0 0 18 14" aria-hidden="true" focusable="false">
            {open ? (
              <path d="M3 1 L15 13 M15 1 L3 13" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />
            ) : (
              <path d="M1 1 H17 M1 7 H17 M1 13 H17" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />
            )}
          </svg>
          Menu
        </button>
        <div
          id="main-menu"
          hidden={!open}
          className="absolute inset-x-0 top-full z-40 max-h-[calc(100vh-4rem)] overflow-y-auto border-t border-board-700 bg-board-900 px-4 pb-4 shadow-lg"
        >
          <nav aria-label="Main">
            {parts.map((s) => (
              <div key={s.group ?? "top"} className="pt-3">
                {s.group && (
                  <p id={`main-menu-${s.group}`} className="px-3 pb-1 text-caption font-semibold uppercase tracking-wide text-chalk-dim">
                    {s.group}
                  </p>
                )}
                <ul aria-labelledby={s.group ? `main-menu-${s.group}` : undefined} className="grid grid-cols-1 gap-1 sm:grid-cols-2">
                  {s.items.map((i) => (
                    <li key={i.href}>
                      <NavLink item={i} current={i.href === current} onPick={close} block />
                    </li>
                  ))}
                </ul>
              </div>
            ))}
          </nav>
          <div className="mt-4 flex flex-wrap items-center justify-between gap-3 border-t border-board-700 pt-3 text-caption">
            <span>{who}</span>
            {signOut}
          </div>
        </div>
      </div>
    </>
  );
}
