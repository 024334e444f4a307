import { z } from "zod";
import { calendarDate } from "@/lib/validation/dates";
import type { Role } from "@/lib/auth/roles";
import { ASSIGNABLE_ROLES } from "@/lib/auth/account-roles";

// The People area's schemas, shared by the forms and the server actions.

const uuid = z.string().uuid();
const emptyToNull = (v: unknown) => (v === "" || v === undefined ? null : v);

/** Ratings: typed as one line separated by commas or semicolons, or already a list. */
const ratingsList = z.preprocess(
  (v) => (typeof v === "string" ? [...new Set(v.split(/[,;\n]/).map((r) => r.trim()))].filter(Boolean) : v),
  z.array(z.string().trim().min(1, "A rating cannot be empty").max(80, "Each rating at most 80 characters")).max(20, "At most 20 ratings"),
);

/**
 * Adding a qualification (no qualificationId) or recording a change to one. The change is in force
 * from `effectiveFrom`; the version it replaces stays in the instructor's file.
 */
export const qualificationSchema = z
  .object({
    personId: uuid,
    qualificationId: z.preprocess(emptyToNull, uuid.nullable()).default(null),
    certificateKind: z.string().trim().min(1, "Enter the kind of certificate").max(100, "At most 100 characters"),
    certificateNumber: z
      .string()
      .trim()
      .min(1, "Enter the certificate number")
      .max(40, "At most 40 characters")
      .regex(/^[A-Za-z0-9][A-Za-z0-9 ./-]*$/, "Letters, digits, spaces, dots, slashes and hyphens only"),
    ratings: ratingsList,
    courseIds: z.array(uuid).max(50, "At most 50 courses").default([]),
    checkInstructor: z.boolean().default(false),
    issuedOn: calendarDate({ required: "Choose the date of issue" }),
    recencyOn: calendarDate({ required: "Choose the date of the last recency activity" }),
    recencyMonths: z.coerce
      .number("Enter a whole number of months")
      .int("Enter a whole number of months")
      .min(1, "At least 1 month")
      .max(120, "At most 120 months"),
    effectiveFrom: calendarDate({ required: "Choose the date this takes effect" }),
    changeNote: z.string().trim().max(500, "At most 500 characters").default(""),
  })
  .superRefine((v, ctx) => {
    if (v.recencyOn && v.issuedOn && v.recencyOn < v.issuedOn)
      ctx.addIssue({ code: "custom", path: ["recencyOn"], message: "Cannot be before the date of issue" });
    if (v.qualificationId && !v.changeNote) ctx.addIssue({ code: "custom", path: ["changeNote"], message: "Say what changed and why" });
  });

export type QualificationFormInput = z.input<typeof qualificationSchema>;
export type QualificationInput = z.output<typeof qualificationSchema>;

// The chief's account changes (people.manage): deactivate or reactivate an account, link a sponsor to a student.
export const setAccountActiveSchema = z.object({ personId: z.string().uuid("choose a person"), active: z.boolean("yes or no") });
export type SetAccountActiveInput = z.output<typeof setAccountActiveSchema>;

export const linkSponsorSchema = z.object({
  sponsorId: z.string().uuid("choose a sponsor"),
  studentId: z.string().uuid("choose a student"),
  relationship: z
    .string()
    .transform((s) => s.replace(/\s+/g, " ").trim())
    .pipe(z.string().min(1, "required").max(60, "at most 60 characters"))
    .optional()
    .default("sponsor"),
});
export type LinkSponsorInput = z.output<typeof linkSponsorSchema>;

// Inviting staff and sponsors, and changing a person's roles (people.manage). Students join through the Roster.
const roleList = z.preprocess(
  (v) => (typeof v === "string" ? [v] : v),
  z
    .array(z.string("choose instructor, chief instructor or sponsor"), "choose at least one role")
    .min(1, "choose at least one role")
    .max(ASSIGNABLE_ROLES.length)
    .refine((rs) => rs.every((r) => (ASSIGNABLE_ROLES as readonly string[]).includes(r)), "choose instructor, chief instructor or sponsor")
    .transform((rs) => [...new Set(rs)] as Role[]),
);

export const invitePersonSchema = z.object({
  name: z.string("enter the person's name").trim().min(1, "enter the person's name").max(200, "at most 200 characters"),
  email: z
    .string("enter an e-mail address")
    .trim()
    .toLowerCase()
    .min(1, "enter an e-mail address")
    .email("not a valid e-mail address")
    .max(254),
  roles: roleList,
});
export type InvitePersonInput = z.output<typeof invitePersonSchema>;

export const changeRolesSchema = z.object({ personId: z.string("choose a person").uuid("choose a person"), roles: roleList });
export type ChangeRolesInput = z.output<typeof changeRolesSchema>;
