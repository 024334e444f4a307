import type { Permission } from "@/lib/auth/permissions";

/** The shell's navigation; each entry shows only to callers who hold its permission. */
export interface NavItem {
  href: string;
  label: string;
  permission: Permission;
}

export const NAV_ITEMS: NavItem[] = [
  { href: "/today", label: "Today", permission: "today.view" },
  { href: "/people", label: "People", permission: "people.view" },
  { href: "/syllabus", label: "Syllabus", permission: "syllabus.view" },
  { href: "/curve-lab", label: "Curve Lab", permission: "demos.view" },
  { href: "/briefings", label: "Briefings", permission: "briefings.view" },
  // one page, two audiences: staff manage, students complete (no role holds both)
  { href: "/assignments", label: "Assignments", permission: "assignments.manage" },
  { href: "/assignments", label: "Assignments", permission: "assignments.complete" },
  { href: "/timetable", label: "Timetable", permission: "timetable.view" },
  { href: "/roster", label: "Roster", permission: "roster.manage" },
  { href: "/ground-log", label: "Ground log", permission: "groundlog.view" },
  // records
  { href: "/records", label: "Records", permission: "checks.record" },
  { href: "/progress", label: "Progress map", permission: "progress.view" },
  { href: "/register", label: "Sign-off register", permission: "register.view" },
  // mail
  { href: "/mail", label: "Mail tray", permission: "mail.tray" },
  { href: "/mail/notes", label: "Notes for sponsors", permission: "sponsornotes.write" },
  { href: "/settings", label: "Settings", permission: "settings.edit" },
];
