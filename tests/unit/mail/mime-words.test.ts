/**
 * @jest-environment node
 */
// The Mail tray shows subjects as recipients read them: a subject with non-ASCII characters is
// sent as RFC 2047 encoded words, stored that way in the sink's index, and decoded for the tray.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import MailComposer from "nodemailer/lib/mail-composer";
import { decodeHeaderWords } from "@/lib/mail/mime-words";
import { listMessages, storeMessage } from "@/lib/mail/sink-store";

async function rawMail(subject: string): Promise<Buffer> {
  return new MailComposer({ from: "school@chalkwing.test", to: "ada@chalkwing.test", subject, text: "body" }).compile().build();
}

describe("decodeHeaderWords", () => {
  let dir: string;
  beforeEach(() => {
    dir = mkdtempSync(path.join(tmpdir(), "chalkwing-sink-"));
  });
  afterEach(() => rmSync(dir, { recursive: true, force: true }));

  test.each([
    "Session moved: Drag and Vmd, now Thu 3 Dec 2026, 09:00 – Zoë’s cohort",
    "Weekly letter: Łucja Brzęczyszczykiewicz, week of Mon 30 Nov 2026",
    `Assignment: ${"a long title with ünïcödé ".repeat(8)}`,
  ])("a subject sent through nodemailer and stored by the sink reads as written: %s", async (subject) => {
    const entry = storeMessage(dir, await rawMail(subject), { from: "school@chalkwing.test", to: ["ada@chalkwing.test"] });
    const [stored] = listMessages(dir);
    expect(stored?.id).toBe(entry.id);
    // the index keeps the header as it travelled (encoded words), which is what the tray used to print
    expect(stored?.subject).toMatch(/=\?UTF-8\?[QB]\?/i);
    expect(await decodeHeaderWords(stored!.subject)).toBe(subject);
  });

  test("a plain subject passes through unchanged", async () => {
    expect(await decodeHeaderWords("Reminder: Drag and the minimum-drag speed")).toBe("Reminder: Drag and the minimum-drag speed");
  });

  test("a hand-written Q-encoded subject with one non-ASCII character", async () => {
    expect(await decodeHeaderWords("=?UTF-8?Q?Caf=C3=A9_briefing?=")).toBe("Café briefing");
  });
});
