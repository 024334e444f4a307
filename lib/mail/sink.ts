// The local mail sink the start and test commands run: `tsx lib/mail/sink.ts`.
// Listens on 127.0.0.1:$SMTP_PORT and stores every message in $MAIL_SINK_DIR.
import path from "node:path";
import { startSink } from "./sink-server";

const port = Number(process.env.SMTP_PORT ?? 2525);
const dir = path.resolve(process.env.MAIL_SINK_DIR ?? ".data/mail-sink");

startSink({ dir, port, onMessage: (e) => console.log(`[sink] ${e.receivedAt} ${e.envelopeTo.join(",")} ${e.subject}`) })
  .then((s) => {
    console.log(`[sink] listening on 127.0.0.1:${s.port}, storing in ${dir}`);
    const stop = () => void s.close().then(() => process.exit(0));
    process.on("SIGTERM", stop);
    process.on("SIGINT", stop);
  })
  .catch((e: Error) => {
    console.error(`[sink] could not start: ${e.message}`);
    process.exit(1);
  });
