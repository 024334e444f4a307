"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { closeCohort, createCohort, renameCohort } from "@/db/access/cohorts/manage-cohorts";
import { addMember, moveMember } from "@/db/access/cohorts/dated-membership";
import { addMemberSchema, closeCohortSchema, createCohortSchema, moveMemberSchema, renameCohortSchema } from "@/lib/cohorts/schema";

function done<T extends { ok: boolean }>(r: T): T {
  if (r.ok) revalidatePath("/cohorts");
  return r;
}

/** Creates a cohort of a course with its lead instructor and start date. */
export async function createCohortAction(input: unknown) {
  return done(
    await runAction("cohorts.manage", createCohortSchema, input, async (data, { user, t }) => createCohort(user, data, t), {
      idempotent: "cohort.create",
    }),
  );
}

/** Renames a cohort; another cohort's name is a 409 naming name. */
export async function renameCohortAction(input: unknown) {
  return done(await runAction("cohorts.manage", renameCohortSchema, input, async (data, { user, t }) => renameCohort(user, data, t)));
}

/** Closes a cohort from a date, once nobody belongs to it then. */
export async function closeCohortAction(input: unknown) {
  return done(await runAction("cohorts.manage", closeCohortSchema, input, async (data, { user, t }) => closeCohort(user, data, t)));
}

/** Adds a student to a cohort from a date. */
export async function addMemberAction(input: unknown) {
  return done(
    await runAction("cohorts.manage", addMemberSchema, input, async (data, { user, t }) => addMember(user, data, t), {
      idempotent: "cohort.add-member",
    }),
  );
}

/** Moves a student to another cohort from a date; the old membership keeps its dates. */
export async function moveMemberAction(input: unknown) {
  return done(
    await runAction("cohorts.manage", moveMemberSchema, input, async (data, { user, t }) => moveMember(user, data, t), {
      idempotent: "cohort.move-member",
    }),
  );
}
