"use server";
import { runAction } from "@/lib/actions/run-action";
import { changeRolesSchema, invitePersonSchema } from "@/lib/people/schema";
import { invitePerson } from "@/db/access/people/invite-person";
import { changeRoles } from "@/db/access/people/change-roles";

/** The chief invites a member of staff or a sponsor by e-mail; the invitation goes through the outbox. */
export async function invitePersonAction(input: unknown) {
  return runAction("people.manage", invitePersonSchema, input, async (data, { user, t }) => invitePerson(t, user, data), {
    idempotent: "people.invite",
  });
}

/** The chief changes a person's roles; the person's sessions end at once. */
export async function changeRolesAction(input: unknown) {
  return runAction("people.manage", changeRolesSchema, input, async (data, { user, t }) => changeRoles(t, user, data));
}
