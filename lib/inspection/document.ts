// The inspection pack as printable content: sections of text lines and tables (plain strings, already
// worded and dated). Other areas add a section by returning one of these (see db/access/inspection).

export type PackBlock =
  | { kind: "text"; text: string; bold?: boolean; mono?: boolean; indent?: boolean }
  | { kind: "table"; header: string[]; rows: string[][]; widths: number[] };

export interface PackSection {
  heading: string;
  blocks: PackBlock[];
}

export interface PackDocument {
  title: string;
  schoolName: string;
  sections: PackSection[];
}
