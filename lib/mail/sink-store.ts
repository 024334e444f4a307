import { appendFileSync, existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { randomUUID } from "node:crypto";

/** One line of the sink's index (`index.jsonl`); the raw message is `<file>` beside it. */
export interface SinkEntry {
  id: string;
  file: string;
  receivedAt: string;
  envelopeFrom: string;
  envelopeTo: string[];
  messageId: string;
  subject: string;
  bytes: number;
}

function headerOf(raw: string, name: string): string {
  const head = raw.split(/\r?\n\r?\n/, 1)[0] ?? "";
  const unfolded = head.replace(/\r?\n[ \t]+/g, " ");
  const m = new RegExp(`^${name}:[ \\t]*(.*)$`, "im").exec(unfolded);
  return m?.[1]?.trim() ?? "";
}

/** Stores a received message: the raw .eml first, then its index line, so the index never names a missing file. */
export function storeMessage(dir: string, raw: Buffer, envelope: { from: string; to: string[] }): SinkEntry {
  mkdirSync(dir, { recursive: true });
  const id = `${Date.now().toString(36)}-${randomUUID().slice(0, 8)}`;
  const file = `${id}.eml`;
  writeFileSync(path.join(dir, file), raw);
  const text = raw.toString("latin1");
  const entry: SinkEntry = {
    id,
    file,
    receivedAt: new Date().toISOString(),
    envelopeFrom: envelope.from,
    envelopeTo: envelope.to,
    messageId: headerOf(text, "Message-ID"),
    subject: headerOf(text, "Subject"),
    bytes: raw.length,
  };
  appendFileSync(path.join(dir, "index.jsonl"), JSON.stringify(entry) + "\n");
  return entry;
}

/** Newest first. */
export function listMessages(dir: string): SinkEntry[] {
  const f = path.join(dir, "index.jsonl");
  if (!existsSync(f)) return [];
  const out: SinkEntry[] = [];
  for (const line of readFileSync(f, "utf8").split("\n")) {
    if (!line.trim()) continue;
    try {
      out.push(JSON.parse(line) as SinkEntry);
    } catch {
      // a line cut short by a crash is skipped
    }
  }
  return out.reverse();
}

const ID_SHAPE = /^[a-z0-9]+-[a-f0-9]{8}$/;

export function readRaw(dir: string, id: string): Buffer | null {
  if (!ID_SHAPE.test(id)) return null;
  const f = path.join(dir, `${id}.eml`);
  return existsSync(f) ? readFileSync(f) : null;
}
