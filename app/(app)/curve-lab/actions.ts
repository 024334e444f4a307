"use server";
import { z } from "zod";
import { runAction } from "@/lib/actions/run-action";
import { HttpError } from "@/lib/http/errors";
import { CALL_KINDS, callAnswer } from "@/components/charts/demo-spec";
import { demoSpecSchema } from "@/components/charts/demo-spec-schema";
import { createDemo, deleteDemo, duplicateDemo, getDemoRevision, recordCall, renameDemo, saveDemoSpec } from "@/db/access/demos";
import { studentMayOpenRevision } from "./_lib/student-access";

const demoName = z.string().trim().min(1, "Enter a name for the demo").max(120, "Name: at most 120 characters");

const saveSchema = z.object({
  demoId: z.string().uuid("demoId: not a demo id").nullable(),
  name: demoName,
  spec: demoSpecSchema,
});

/**
 * Saves a demo from the builder: a new demo when `demoId` is null; otherwise the current
 * revision is updated, or a new revision is made when the demo is already in use.
 */
export async function saveDemoAction(input: unknown) {
  return runAction(
    "demos.edit",
    saveSchema,
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

const idSchema = z.object({ demoId: z.string().uuid("demoId: not a demo id") });

export async function renameDemoAction(input: unknown) {
  return runAction("demos.edit", idSchema.extend({ name: demoName }), input, async ({ demoId, name }, { user, t }) =>
    renameDemo(user, demoId, name, t),
  );
}

export async function duplicateDemoAction(input: unknown) {
  return runAction("demos.edit", idSchema, input, async ({ demoId }, { user, t }) => duplicateDemo(user, demoId, t), {
    idempotent: "demo.duplicate",
  });
}

export async function deleteDemoAction(input: unknown) {
  return runAction("demos.edit", idSchema, input, async ({ demoId }, { user, t }) => deleteDemo(user, demoId, t));
}

const callSchema = z.object({
  demoRevisionId: z.string().uuid("demoRevisionId: not a demo revision id"),
  kind: z.enum(CALL_KINDS, { error: "kind must be vmd, stall or gust" }),
  predictedMs: z
    .number({ error: "predictedMs must be a number" })
    .gt(0, "predictedMs must be above 0 m/s")
    .max(500, "predictedMs must be at most 500 m/s"),
});

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
      return recordCall(
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
    },
    { idempotent: "demo.call" },
  );
}
