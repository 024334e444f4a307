// Reading an upload's raw body with a byte limit, for route handlers that take files
// (handouts, transfer-credit evidence, roster CSV). Bytes are counted as they arrive, so an
// oversized upload is refused without buffering it all.
import type { HttpError } from "@/lib/http/errors";

/**
 * Reads `body`, keeping the bytes while they stay within `limit`. Past the limit it reads on and
 * throws away up to `drainLimit` bytes in all (so the client sees the refusal rather than a broken
 * connection), then cancels the stream. `over` tells that the body was larger than `limit`.
 */
export async function readLimited(
  body: ReadableStream<Uint8Array> | null,
  limit: number,
  drainLimit: number,
): Promise<{ bytes: Buffer; over: boolean }> {
  if (!body) return { bytes: Buffer.alloc(0), over: false };
  const reader = body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limit) {
      if (total > drainLimit) {
        await reader.cancel();
        break;
      }
      continue;
    }
    chunks.push(value);
  }
  return total > limit ? { bytes: Buffer.alloc(0), over: true } : { bytes: Buffer.concat(chunks), over: false };
}

/**
 * The body of an upload of at most `limit` bytes. A larger one, declared in Content-Length or
 * sent, is drained (up to 4 × `limit`) and refused with `tooBig()`.
 */
export async function readUpload(req: Request, limit: number, tooBig: () => HttpError): Promise<Buffer> {
  const drainLimit = 4 * limit;
  const length = Number(req.headers.get("content-length") ?? "NaN");
  if (Number.isFinite(length) && length > limit) {
    await readLimited(req.body, 0, drainLimit);
    throw tooBig();
  }
  const { bytes, over } = await readLimited(req.body, limit, drainLimit);
  if (over) throw tooBig();
  return bytes;
}
