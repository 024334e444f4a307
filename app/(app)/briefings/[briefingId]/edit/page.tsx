import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { requirePagePermission } from "@/lib/auth/guard";
import { briefingAsInput } from "@/db/access/briefings/save-revision";
import { editorChoices } from "@/db/access/briefings/editor-choices";
import { getBriefing } from "@/db/access/briefings/read-briefing";
import { BriefingEditor } from "../../_components/briefing-editor";
import { uuidParam } from "@/lib/http/api";

export const metadata: Metadata = { title: "Edit briefing" };
export const dynamic = "force-dynamic";

export default async function EditBriefingPage({ params }: { params: Promise<{ briefingId: string }> }) {
  const { briefingId } = await params;
  const user = await requirePagePermission("briefings.edit", `/briefings/${briefingId}/edit`);
  if (!uuidParam.safeParse(briefingId).success) notFound();
  const [input, view] = await Promise.all([briefingAsInput(user, briefingId), getBriefing(user, briefingId)]);
  if (!input || !view) notFound();
  const choices = await editorChoices(user.schoolId, input.demoRevisionIds);
  const allHandouts = view.handouts.map((h) => ({ id: h.id, fileName: h.fileName }));
  return (
    <div className="space-y-6">
      <header>
        <h1 className="text-display">Edit briefing</h1>
        <p className="text-ink-soft">
          Saving makes revision {view.currentNumber + 1}. Revision {view.currentNumber} and earlier stay as they were, for the sessions that
          used them.
        </p>
      </header>
      <BriefingEditor
        briefingId={briefingId}
        nextNumber={view.currentNumber + 1}
        choices={choices}
        handouts={allHandouts}
        initial={{ ...input, changeNote: "" }}
      />
    </div>
  );
}
