import Link from "next/link";

const TABS = [
  { href: "/mail", label: "Mail tray" },
  { href: "/mail/outbox", label: "Outbox" },
  { href: "/mail/notes", label: "Notes for sponsors" },
  { href: "/mail/letters", label: "Weekly letters" },
] as const;

export function MailTabs({ current, show }: { current: (typeof TABS)[number]["href"]; show: readonly string[] }) {
  return (
    <nav aria-label="Mail pages" className="flex flex-wrap gap-2">
      {TABS.filter((t) => show.includes(t.href)).map((t) => (
        <Link
          key={t.href}
          href={t.href}
          aria-current={t.href === current ? "page" : undefined}
          className={t.href === current ? "btn bg-wing-700 text-white" : "btn-quiet"}
        >
          {t.label}
        </Link>
      ))}
    </nav>
  );
}
