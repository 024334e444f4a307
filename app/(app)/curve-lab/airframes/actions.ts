"use server";
import { z } from "zod";
import { runAction } from "@/lib/actions/run-action";
import { createAirframe, duplicateAirframe, setAirframeRetired, updateAirframe } from "@/db/access/airframes";
import { airframeFormSchema } from "./_lib/airframe-schema";

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

const idSchema = z.object({ airframeId: z.string().uuid("airframeId: not an aircraft profile id") });

export async function updateAirframeAction(input: unknown) {
  return runAction(
    "airframes.edit",
    z.object({ airframeId: idSchema.shape.airframeId, values: airframeFormSchema }),
    input,
    async ({ airframeId, values }, { user, t }) => updateAirframe(user.schoolId, airframeId, values, t),
  );
}

export async function duplicateAirframeAction(input: unknown) {
  return runAction("airframes.edit", idSchema, input, async ({ airframeId }, { user, t }) =>
    duplicateAirframe(user.schoolId, airframeId, user.id, t),
  );
}

export async function retireAirframeAction(input: unknown) {
  return runAction("airframes.edit", idSchema.extend({ retired: z.boolean() }), input, async ({ airframeId, retired }, { user, t }) =>
    setAirframeRetired(user.schoolId, airframeId, retired, t),
  );
}
