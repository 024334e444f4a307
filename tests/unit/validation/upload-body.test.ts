/**
 * @jest-environment node
 */
// Upload bodies read with a byte limit (lib/http/body.ts), as the handout, transfer-evidence and
// roster routes read them: kept within the limit, refused past it without keeping the bytes, read
// on only up to the drain limit, and a declared Content-Length over the limit refused before reading.
import { readLimited, readUpload } from "@/lib/http/body";
import { HttpError } from "@/lib/http/errors";

/** A body sent in `chunks` chunks of `size` bytes; `pulled()` tells how many chunks were read. */
function body(chunks: number, size: number) {
  let sent = 0;
  let cancelled = false;
  const stream = new ReadableStream<Uint8Array>({
    pull(controller) {
      if (sent === chunks) return controller.close();
      controller.enqueue(new Uint8Array(size).fill(sent + 1));
      sent++;
    },
    cancel() {
      cancelled = true;
    },
  });
  return { stream, pulled: () => sent, cancelled: () => cancelled };
}

const tooBig = () => new HttpError(413, "file: larger than the limit", "file");

describe("readLimited", () => {
  it("keeps every byte of a body within the limit", async () => {
    const b = body(3, 4);
    const r = await readLimited(b.stream, 12, 48);
    expect(r.over).toBe(false);
    expect([...r.bytes]).toEqual([1, 1, 1, 1, 2, 2, 2, 2, 3, 3, 3, 3]);
    expect(b.cancelled()).toBe(false);
  });

  it("reads a missing body as empty", async () => {
    expect(await readLimited(null, 10, 40)).toEqual({ bytes: Buffer.alloc(0), over: false });
  });

  it("refuses a body past the limit, keeping nothing, and reads on to the end within the drain limit", async () => {
    const b = body(5, 4);
    const r = await readLimited(b.stream, 12, 48);
    expect(r).toEqual({ bytes: Buffer.alloc(0), over: true });
    expect(b.pulled()).toBe(5);
    expect(b.cancelled()).toBe(false);
  });

  it("cancels the stream once past the drain limit", async () => {
    const b = body(100, 4);
    const r = await readLimited(b.stream, 12, 20);
    expect(r.over).toBe(true);
    // 6 chunks (24 bytes) pass the drain limit of 20; the stream may have queued one more
    expect(b.pulled()).toBeLessThan(100);
    expect(b.cancelled()).toBe(true);
  });
});

describe("readUpload", () => {
  const request = (chunks: number, size: number, declared?: number) => {
    const b = body(chunks, size);
    const headers = declared === undefined ? {} : { "content-length": String(declared) };
    return { b, req: new Request("http://127.0.0.1/upload", { method: "POST", body: b.stream, headers, duplex: "half" } as RequestInit) };
  };

  it("returns the body within the limit", async () => {
    const { req } = request(2, 5);
    expect((await readUpload(req, 10, tooBig)).length).toBe(10);
  });

  it("refuses with the caller's error a body sent larger than the limit", async () => {
    const { req } = request(3, 5);
    await expect(readUpload(req, 10, tooBig)).rejects.toMatchObject({ status: 413, field: "file" });
  });

  it("refuses a declared Content-Length over the limit", async () => {
    const { req } = request(1, 5, 11);
    await expect(readUpload(req, 10, tooBig)).rejects.toMatchObject({ status: 413, field: "file" });
  });
});
