"use server";
import { runAction } from "@/lib/actions/run-action";
import { createAirframe, duplicateAirframe, setAirframeRetired, updateAirframe } from "@/db/access/curve-lab/save-airframe";
import { airframeFormSchema, airframeIdSchema, retireAirframeSchema, updateAirframeSchema } from "@/lib/curve-lab/schema";

/** Creates an aircraft profile from the form (any units); nothing is written when a field is wrong. */
export async function createAirframeAction(input: unknown) {
  return runAction(
    "airframes.edit",
    airframeFormSchema,
    input,
    async (data, { user, t }) => createAirframe(user.schoolId, user.id, data, t),
    {
      idempotent: "airframe.create",
    },
  );
}

export async function updateAirframeAction(input: unknown) {
  return runAction("airframes.edit", updateAirframeSchema, input, async ({ airframeId, values }, { user, t }) =>
    updateAirframe(user.schoolId, airframeId, values, t),
  );
}

export async function duplicateAirframeAction(input: unknown) {
  return runAction(
    "airframes.edit",
    airframeIdSchema,
    input,
    async ({ airframeId }, { user, t }) => duplicateAirframe(user.schoolId, airframeId, user.id, t),
    { idempotent: "airframe.duplicate" },
  );
}

export async function retireAirframeAction(input: unknown) {
  return runAction("airframes.edit", retireAirframeSchema, input, async ({ airframeId, retired }, { user, t }) =>
    setAirframeRetired(user.schoolId, airframeId, retired, t),
  );
}
