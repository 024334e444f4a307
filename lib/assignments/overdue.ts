// Assignments: "overdue" is derived from the due date, never stored.

/** Overdue: not done and the due date has passed in the school's calendar (due today is not overdue). */
export function isOverdue(dueOn: string, done: boolean, today: string): boolean {
  return !done && dueOn < today;
}
