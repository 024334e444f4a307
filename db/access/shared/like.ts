// The one LIKE / ILIKE pattern for "contains this text": the text taken literally (\, % and _
// escaped with PostgreSQL's default escape character), between two wildcards.
export function containsPattern(text: string): string {
  return `%${text.replace(/[\\%_]/g, (ch) => `\\${ch}`)}%`;
}
