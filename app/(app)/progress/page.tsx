import type { Metadata } from "next";
import Link from "next/link";
import { redirect } from "next/navigation";
import { requirePagePermission, can } from "@/lib/auth/guard";
import { progressStudentsFor } from "@/db/access/records/student-list";

export const metadata: Metadata = { title: "Progress map" };
export const dynamic = "force-dynamic";

export default async function ProgressIndexPage() {
  const user = await requirePagePermission("progress.view", "/progress");
  // who sees no one but themself: straight to the one map, decided before any student is read
  const staff = can(user, "students.all") || can(user, "students.taught");
  if (can(user, "students.own") && !staff && !can(user, "students.sponsored")) redirect(`/progress/${user.id}`);
  const students = await progressStudentsFor(user);
  if (students.length === 1 && !staff) redirect(`/progress/${students[0]!.id}`);
  return (
    <div className="space-y-6">
      <h1 className="text-display">Progress map</h1>
      {students.length === 0 ? (
        <p className="text-ink-soft">
          No Progress map to show{can(user, "students.sponsored") ? ": the students you sponsor have not shared their progress." : "."}
        </p>
      ) : (
        <ul className="grid gap-2 sm:grid-cols-2 lg:grid-cols-3">
          {students.map((s) => (
            <li key={s.id}>
              <Link href={`/progress/${s.id}`} className="btn-quiet w-full justify-start">
                {s.name}
                {s.cohortName && <span className="text-caption font-normal text-ink-soft">{s.cohortName}</span>}
              </Link>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
