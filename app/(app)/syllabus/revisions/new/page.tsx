import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { requirePagePermission } from "@/lib/auth/guard";
import { defaultCourseId, listCoursesWithLatestRevision } from "@/db/access/syllabus/courses";
import { getSyllabusRevision } from "@/db/access/syllabus/revisions";
import { uuidParam } from "@/lib/http/api";
import { RevisionEditor } from "../../_components/revision-editor";

export const metadata: Metadata = { title: "New syllabus revision" };
export const dynamic = "force-dynamic";

export default async function NewSyllabusRevisionPage({
  searchParams,
}: {
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const user = await requirePagePermission("syllabus.edit", "/syllabus/revisions/new");
  const courses = await listCoursesWithLatestRevision(user.schoolId);
  const param = (await searchParams).course;
  const wanted = typeof param === "string" && uuidParam.safeParse(param).success ? param : await defaultCourseId(user.schoolId);
  const course = courses.find((c) => c.id === wanted);
  if (!course) notFound();
  const current = course.revisionId ? await getSyllabusRevision(user.schoolId, course.revisionId) : null;
  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-display">New syllabus revision</h1>
        <p className="text-ink-soft">
          {course.code} · {course.title}.{" "}
          {current
            ? `Starts from revision ${current.number}; revision ${current.number} stays as it is for the enrolments and briefings on it.`
            : "The first revision of this course."}
        </p>
      </header>
      <RevisionEditor
        nextNumber={(course.revisionNumber ?? 0) + 1}
        initial={{
          courseId: course.id,
          approvedOn: "",
          effectiveFrom: "",
          changeNote: "",
          stages: current
            ? current.stages.map((s) => ({
                code: s.code,
                title: s.title,
                items: s.items.map(({ code, title, objective, completionStandard, requiredLevel }) => ({
                  code,
                  title,
                  objective,
                  completionStandard,
                  requiredLevel,
                })),
              }))
            : [
                {
                  code: "",
                  title: "",
                  items: [{ code: "", title: "", objective: "", completionStandard: "", requiredLevel: "understanding" }],
                },
              ],
        }}
      />
    </div>
  );
}
