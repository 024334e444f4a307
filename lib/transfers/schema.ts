import { z } from "zod";
import { calendarDate } from "@/lib/validation/dates";

// Transfers in: the fields of a transfer credit, shared by the form and the upload route
// (multipart form data: every value arrives as text, the file apart).

const uuid = z.string().uuid("not a valid id");

export const TEST_KINDS = ["knowledge", "proficiency", "both"] as const;
export type TransferTestKind = (typeof TEST_KINDS)[number];

export const EVIDENCE_MAX_BYTES = 10 * 1024 * 1024;

export const transferCreditSchema = z.object({
  studentId: uuid,
  sourceSchool: z.string().trim().min(1, "name the earlier school").max(200, "at most 200 characters"),
  sourceApproved: z.enum(["yes", "no"], "say whether the earlier course was approved"),
  creditedMinutes: z.coerce
    .number("a whole number of minutes")
    .int("a whole number of minutes")
    .min(0, "0 or more")
    .max(100_000, "at most 100000"),
  itemIds: z.array(uuid).max(500, "at most 500 items").default([]),
  testKind: z.enum(TEST_KINDS, "choose knowledge, proficiency or both"),
  testTakenOn: calendarDate({ required: "give the date of this school's test" }),
  testResult: z.string().trim().min(1, "give the result of this school's test").max(200, "at most 200 characters"),
  note: z.string().trim().max(2000, "at most 2000 characters").default(""),
  idempotencyKey: z
    .string()
    .regex(/^[A-Za-z0-9_-]{8,100}$/, "the form is out of date: reload the page")
    .optional(),
});
export type TransferCreditInput = z.output<typeof transferCreditSchema>;
