import { SMTPServer } from "smtp-server";
import { storeMessage, type SinkEntry } from "./sink-store";

export interface RunningSink {
  port: number;
  received: SinkEntry[];
  close(): Promise<void>;
}

/**
 * A local SMTP server on 127.0.0.1 that accepts every message and stores it (raw .eml and an
 * index line) in `dir`. Used by the start and test commands and by integration tests.
 * `port` 0 picks a free port.
 */
export function startSink(opts: { dir: string; port: number; onMessage?: (e: SinkEntry) => void }): Promise<RunningSink> {
  const received: SinkEntry[] = [];
  const server = new SMTPServer({
    secure: false,
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    logger: false,
    size: 10 * 1024 * 1024,
    onAuth(_auth, _session, cb) {
      cb(null, { user: "sink" });
    },
    onData(stream, session, cb) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("end", () => {
        try {
          const from = session.envelope.mailFrom ? session.envelope.mailFrom.address : "";
          const entry = storeMessage(opts.dir, Buffer.concat(chunks), { from, to: session.envelope.rcptTo.map((r) => r.address) });
          received.push(entry);
          opts.onMessage?.(entry);
          cb(null, `stored ${entry.id}`);
        } catch (e) {
          cb(e as Error);
        }
      });
    },
  });
  return new Promise((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port, "127.0.0.1", () => {
      const addr = server.server.address();
      const port = typeof addr === "object" && addr ? addr.port : opts.port;
      resolve({
        port,
        received,
        close: () => new Promise<void>((r) => server.close(() => r())),
      });
    });
  });
}
