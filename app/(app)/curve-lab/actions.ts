"use server";
import { runAction } from "@/lib/actions/run-action";
import { HttpError } from "@/lib/http/errors";
import { callAnswer } from "@/lib/curve-lab/demo-spec";
import { callSchema, demoIdSchema, renameDemoSchema, saveDemoSchema } from "@/lib/curve-lab/schema";
import { createDemo, deleteDemo, duplicateDemo, renameDemo, saveDemoSpec } from "@/db/access/curve-lab/save-demo";
import { getDemoRevision } from "@/db/access/curve-lab/demos";
import { recordCallOnce } from "@/db/access/curve-lab/call-once";
import { completeDemoAssignmentsOnCall } from "@/db/access/assignments/complete-on-call";
import { studentMayOpenRevision } from "./_lib/student-access";

/**
 * Saves a demo from the builder: a new demo when `demoId` is null; otherwise the current
 * revision is updated, or a new revision is made when the demo is already in use.
 */
export async function saveDemoAction(input: unknown) {
  return runAction(
    "demos.edit",
    saveDemoSchema,
    input,
    async ({ demoId, name, spec }, { user, t }) => {
      if (demoId === null) return createDemo(user, name, spec, t);
      const saved = await saveDemoSpec(user, demoId, spec, t);
      await renameDemo(user, demoId, name, t);
      return saved;
    },
    { idempotent: "demo.save" },
  );
}

export async function renameDemoAction(input: unknown) {
  return runAction("demos.edit", renameDemoSchema, input, async ({ demoId, name }, { user, t }) => renameDemo(user, demoId, name, t));
}

export async function duplicateDemoAction(input: unknown) {
  return runAction("demos.edit", demoIdSchema, input, async ({ demoId }, { user, t }) => duplicateDemo(user, demoId, t), {
    idempotent: "demo.duplicate",
  });
}

export async function deleteDemoAction(input: unknown) {
  return runAction("demos.edit", demoIdSchema, input, async ({ demoId }, { user, t }) => deleteDemo(user, demoId, t));
}

/**
 * A student's Call it first: the prediction is stored with the answer the server computes from
 * the demo revision (never from the browser) and its error.
 */
export async function makeCallAction(input: unknown) {
  return runAction(
    "demos.call",
    callSchema,
    input,
    async ({ demoRevisionId, kind, predictedMs }, { user, t }) => {
      const revision = await getDemoRevision(user.schoolId, demoRevisionId);
      if (!revision || !(await studentMayOpenRevision(user.schoolId, demoRevisionId, user.id))) {
        throw new HttpError(404, "demoRevisionId: no such demo among your assignments", "demoRevisionId");
      }
      if (revision.spec.callKind !== kind) throw new HttpError(400, "kind: this demo does not ask for that call", "kind");
      const actualMs = callAnswer(revision.spec, kind);
      // one call per student per revision: a second call returns the first, unchanged
      const call = await recordCallOnce(
        {
          schoolId: user.schoolId,
          demoRevisionId,
          studentId: user.id,
          markerKind: kind,
          speedAxis: revision.spec.axis.speed,
          predictedMs,
          actualMs,
        },
        t,
      );
      // the call completes the student's assignments of this demo, in the transaction that stores it
      await completeDemoAssignmentsOnCall(user.schoolId, user.id, demoRevisionId, t);
      return call;
    },
    { idempotent: "demo.call" },
  );
}
