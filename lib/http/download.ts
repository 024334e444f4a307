// Download names built from a person's name (training record, inspection pack, logbook CSV).

/** The name as the safe part of a download's file name: ASCII letters and digits joined by "-", lower case ("Inès Varga" → "in-s-varga"); "student" when nothing is left. */
export function fileNamePart(name: string): string {
  return (
    name
      .replace(/[^A-Za-z0-9]+/g, "-")
      .replace(/^-|-$/g, "")
      .toLowerCase() || "student"
  );
}
