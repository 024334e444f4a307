import type { Permission } from "@/lib/auth/permissions";

/** The groups of the navigation on a wide screen (and the headings of the phone menu). */
export type NavGroup = "Teaching" | "Records" | "School";
export const NAV_GROUPS: NavGroup[] = ["Teaching", "Records", "School"];

/** The shell's navigation; each entry shows only to callers who hold its permission. No group: always shown on its own. */
export interface NavItem {
  href: string;
  label: string;
  permission: Permission;
  group?: NavGroup;
}

export const NAV_ITEMS: NavItem[] = [
  { href: "/today", label: "Today", permission: "today.view" },
  // teaching
  { href: "/syllabus", label: "Syllabus", permission: "syllabus.view", group: "Teaching" },
  { href: "/curve-lab", label: "Curve Lab", permission: "demos.view", group: "Teaching" },
  { href: "/briefings", label: "Briefings", permission: "briefings.view", group: "Teaching" },
  // one page, two audiences: staff manage, students complete (no role holds both)
  { href: "/assignments", label: "Assignments", permission: "assignments.manage", group: "Teaching" },
  { href: "/assignments", label: "Assignments", permission: "assignments.complete", group: "Teaching" },
  { href: "/timetable", label: "Timetable", permission: "timetable.view", group: "Teaching" },
  { href: "/practice", label: "Practice", permission: "practice.take", group: "Teaching" },
  // records
  { href: "/ground-log", label: "Ground log", permission: "groundlog.view", group: "Records" },
  { href: "/records", label: "Records", permission: "checks.record", group: "Records" },
  { href: "/progress", label: "Progress map", permission: "progress.view", group: "Records" },
  { href: "/register", label: "Sign-off register", permission: "register.view", group: "Records" },
  { href: "/endorsements", label: "Endorsements", permission: "endorsements.view", group: "Records" },
  { href: "/endorsements/pass-rate", label: "Pass rate", permission: "reports.view", group: "Records" },
  { href: "/transfers", label: "Transfers in", permission: "transfers.manage", group: "Records" },
  { href: "/retention", label: "Retention", permission: "retention.manage", group: "Records" },
  // school
  { href: "/people", label: "People", permission: "people.view", group: "School" },
  { href: "/roster", label: "Roster", permission: "roster.manage", group: "School" },
  { href: "/rooms", label: "Rooms", permission: "rooms.manage", group: "School" },
  { href: "/cohorts", label: "Cohorts", permission: "cohorts.manage", group: "School" },
  { href: "/mail", label: "Mail tray", permission: "mail.tray", group: "School" },
  { href: "/mail/notes", label: "Notes for sponsors", permission: "sponsornotes.write", group: "School" },
  { href: "/mail/letters", label: "Weekly letters", permission: "mail.letters", group: "School" },
  // the student's and the sponsor's own pages
  { href: "/sharing", label: "Sharing", permission: "sharing.manage" },
  { href: "/letters", label: "Weekly letters", permission: "letters.received" },
  { href: "/settings", label: "Settings", permission: "settings.edit", group: "School" },
];

/** What the browser half of the navigation needs (plain data, no permission names). */
export interface ShownNavItem {
  href: string;
  label: string;
  group: NavGroup | null;
}

/** The one nav entry the path belongs to: the longest href that is the path or a folder above it. */
export function currentNavHref(items: { href: string }[], pathname: string): string | null {
  let best: string | null = null;
  for (const { href } of items) {
    if (pathname === href || pathname.startsWith(href.endsWith("/") ? href : `${href}/`)) {
      if (!best || href.length > best.length) best = href;
    }
  }
  return best;
}

/** Up to this many links, a wide screen shows them in one flat row; more are grouped. */
export const FLAT_NAV_LIMIT = 6;
