import { addMonths, format, parseISO } from "date-fns";

// An instructor's recency in the inspection pack: the last day it runs to is `months` calendar
// months after the recency activity (date-fns addMonths, as db/access/records/signer-standing.ts
// counts it); the instructor is current on a day before that one.

export function recencyDue(recencyOn: string, months: number): string {
  return format(addMonths(parseISO(recencyOn), months), "yyyy-MM-dd");
}

export function isCurrentOn(day: string, dueOn: string): boolean {
  return day < dueOn;
}
