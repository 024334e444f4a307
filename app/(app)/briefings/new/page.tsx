import type { Metadata } from "next";
import { requirePagePermission } from "@/lib/auth/guard";
import { editorChoices } from "@/db/access/briefings/editor-choices";
import { defaultCourseId } from "@/db/access/syllabus/courses";
import { BriefingEditor } from "../_components/briefing-editor";

export const metadata: Metadata = { title: "New briefing" };
export const dynamic = "force-dynamic";

export default async function NewBriefingPage() {
  const user = await requirePagePermission("briefings.edit", "/briefings/new");
  const choices = await editorChoices(user.schoolId);
  const preferred = await defaultCourseId(user.schoolId);
  const course = choices.courses.find((c) => c.id === preferred) ?? choices.courses[0];
  const latest = choices.syllabusRevisions.find((r) => r.courseId === course?.id);
  return (
    <div className="space-y-6">
      <h1 className="text-display">New briefing</h1>
      {!course || !latest ? (
        <p className="text-ink-soft">The school has no course with a syllabus yet.</p>
      ) : (
        <BriefingEditor
          nextNumber={1}
          choices={choices}
          handouts={[]}
          initial={{
            courseId: course.id,
            syllabusRevisionId: latest.id,
            title: "",
            objective: "",
            syllabusItemIds: [],
            elements: [{ title: "", instructorActions: "", studentActions: "", minutes: 10 }],
            equipment: "",
            demoRevisionIds: [],
            completionStandard: "",
            handoutIds: [],
            changeNote: "First issue",
          }}
        />
      )}
    </div>
  );
}
