// GET /api/demos: the demos the caller may open (staff: the school's; a student: those assigned to them).
import { NextResponse } from "next/server";
import { route } from "@/lib/http/api";
import { can } from "@/lib/auth/guard";
import { listDemos } from "@/db/access/curve-lab/demos";
import { listAssignedDemosForStudent } from "@/db/access/assignments/assigned-to-student";

export const dynamic = "force-dynamic";

export const GET = route("demos.view", async ({ user }) => {
  if (can(user, "demos.edit")) {
    const rows = await listDemos(user.schoolId);
    return NextResponse.json({ rows: rows.map((r) => ({ ...r, primary: r.name })) });
  }
  const assigned = await listAssignedDemosForStudent(user.schoolId, user.id);
  const seen = new Set<string>();
  const rows = assigned
    .filter((a) => (seen.has(a.demoId) ? false : (seen.add(a.demoId), true)))
    .map((a) => ({
      id: a.demoId,
      primary: a.name,
      name: a.name,
      revisionId: a.demoRevisionId,
      dueOn: a.dueOn,
      viaBriefingTitle: a.viaBriefingTitle,
    }));
  return NextResponse.json({ rows });
});
