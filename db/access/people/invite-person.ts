import "server-only";
import type { Transaction } from "sequelize";
import { HttpError } from "@/lib/http/errors";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";
import type { Role } from "@/lib/auth/roles";
import { composeMail } from "@/lib/mail/compose";
import type { InvitePersonInput } from "@/lib/people/schema";
import { createPerson } from "./create-person";
import { getSchool } from "../shared/school";
import { enqueueMail } from "../mail/outbox";
import { createSetPasswordLink } from "../mail/set-password";
import { writeAudit } from "../records/audit-chain";

// The chief invites a member of staff or a sponsor: the account (no password) and the invitation
// to choose one (a one-time link, 7 days) are written in one transaction, the mail through the
// outbox, as the Roster does for a student (roster/add-student.ts). The action's idempotency key
// makes a double submit return the first result; the unique e-mail refuses a second account.

/** The invitation mail of a new account, written to the outbox in the transaction that creates it. */
export async function queueInvitation(t: Transaction, p: { schoolId: string; personId: string; name: string; email: string }) {
  const s = await getSchool(p.schoolId, t);
  const school = { name: s.name, timeZone: s.timeZone, senderName: s.settings.mailSenderName ?? undefined };
  const link = await createSetPasswordLink(t, p.personId);
  const mail = composeMail("invitation", { name: p.name, setPasswordUrl: link.url, expiresAt: link.expiresAt }, school);
  await enqueueMail(t, {
    schoolId: p.schoolId,
    kind: "invitation",
    idempotencyKey: `invitation:${p.personId}:1`,
    recipientId: p.personId,
    to: p.email,
    ...mail,
  });
}

export async function invitePerson(
  t: Transaction,
  user: CurrentUser,
  input: InvitePersonInput,
): Promise<{ personId: string; name: string; email: string; roles: Role[] }> {
  if (!can(user, "people.manage")) throw new HttpError(403, "You may not manage accounts");
  const person = await createPerson({ schoolId: user.schoolId, name: input.name, email: input.email, roles: input.roles }, t).catch(
    (e: unknown) => {
      // createPerson checks first; the unique index on lower(email) catches a writer that slipped in between
      if (e instanceof HttpError || (e as { parent?: { code?: string } })?.parent?.code === "23505")
        throw new HttpError(409, "email: already belongs to an account", "email");
      throw e;
    },
  );
  await queueInvitation(t, { schoolId: user.schoolId, personId: person.id, name: person.name, email: person.email });
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "person.invited",
    recordType: "person",
    recordId: person.id,
    after: { name: person.name, email: person.email, roles: person.roles },
  });
  return { personId: person.id, name: person.name, email: person.email, roles: person.roles };
}
