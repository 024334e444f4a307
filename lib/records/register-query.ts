import { z } from "zod";

const date = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, "must be a date (yyyy-mm-dd)")
  .refine((v) => {
    const d = new Date(`${v}T00:00:00Z`);
    return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === v;
  }, "must be a real calendar date");
const emptyToUndefined = (v: unknown) => (v === "" ? undefined : v);

/** The Sign-off register's filters, from a query string; a bad one is refused naming it. */
export const registerQuerySchema = z
  .object({
    instructor: z.preprocess(emptyToUndefined, z.string().uuid("must be an instructor id").optional()),
    cohort: z.preprocess(emptyToUndefined, z.string().uuid("must be a cohort id").optional()),
    stage: z.preprocess(emptyToUndefined, z.string().uuid("must be a stage id").optional()),
    from: z.preprocess(emptyToUndefined, date.optional()),
    to: z.preprocess(emptyToUndefined, date.optional()),
  })
  .strict()
  .refine((q) => !q.from || !q.to || q.from <= q.to, { path: ["to"], message: "must be on or after from" });

export type RegisterQuery = z.output<typeof registerQuerySchema>;

export function toFilter(q: RegisterQuery) {
  return { instructorId: q.instructor, cohortId: q.cohort, stageId: q.stage, from: q.from, to: q.to };
}
