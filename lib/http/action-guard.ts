// Server-action requests (POST with a `Next-Action` header) checked in proxy.ts before the
// framework sees them. Next.js would run an action without an Origin header even with the
// session cookie, and answers a foreign or `null` Origin, an oversized body, a body that is not
// JSON or deeply nested arrays with a 500. Here they get 403 / 413 / 400 in the API's error shape.

/** Next.js's own default limit for server-action bodies (`serverActions.bodySizeLimit`, 1 MB). */
export const ACTION_BODY_LIMIT = 1024 * 1024;
/** No form of ours nests arguments anywhere near this deep. */
export const ACTION_MAX_DEPTH = 32;

function refusal(status: number, message: string, field: string): Response {
  return new Response(JSON.stringify({ error: { status, message, field } }), {
    status,
    headers: { "content-type": "application/json", "cache-control": "no-store" },
  });
}

/** The origins a browser on our own pages sends: the configured one and this host's. */
export function ownOrigins(req: Request): Set<string> {
  const out = new Set<string>();
  if (process.env.NEXTAUTH_URL) {
    try {
      out.add(new URL(process.env.NEXTAUTH_URL).origin);
    } catch {
      // an unusable setting adds nothing
    }
  }
  const host = req.headers.get("host");
  if (host) {
    out.add(`http://${host}`);
    out.add(`https://${host}`);
  }
  return out;
}

/** Depth of `[`/`{` nesting in JSON text, without parsing (so without recursion). */
export function jsonDepth(text: string): number {
  let depth = 0;
  let max = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 92 /* \ */) i++;
      else if (c === 34 /* " */) inString = false;
    } else if (c === 34) inString = true;
    else if (c === 91 || c === 123) max = Math.max(max, ++depth);
    else if (c === 93 || c === 125) depth--;
  }
  return max;
}

async function readCapped(req: Request, limit: number): Promise<Uint8Array | null> {
  if (!req.body) return new Uint8Array(0);
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    size += value.byteLength;
    if (size > limit) {
      await reader.cancel();
      return null;
    }
    chunks.push(value);
  }
  const out = new Uint8Array(size);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

/** A refusal for a hostile server-action request, or null to let it through. */
export async function refuseHostileAction(req: Request): Promise<Response | null> {
  if (!req.headers.has("next-action")) return null;
  if (req.method !== "POST") return refusal(405, "method: server actions are POST only", "method");
  const origin = req.headers.get("origin");
  if (!origin || origin === "null" || !ownOrigins(req).has(origin)) return refusal(403, "Cross-site request refused", "origin");
  const declared = req.headers.get("content-length");
  if (declared !== null && !(Number(declared) <= ACTION_BODY_LIMIT))
    return refusal(413, `body: larger than ${ACTION_BODY_LIMIT / 1024} KB`, "body");
  const type = (req.headers.get("content-type") ?? "").split(";")[0]!.trim().toLowerCase();
  if (type === "multipart/form-data") {
    // forms with files: only the size is ours to check; read a copy, the action gets the original
    if (declared === null && (await readCapped(req.clone(), ACTION_BODY_LIMIT)) === null)
      return refusal(413, `body: larger than ${ACTION_BODY_LIMIT / 1024} KB`, "body");
    return null;
  }
  if (type !== "text/plain" && type !== "application/json" && type !== "") return refusal(400, "body: not a form submission", "body");
  const bytes = await readCapped(req.clone(), ACTION_BODY_LIMIT);
  if (bytes === null) return refusal(413, `body: larger than ${ACTION_BODY_LIMIT / 1024} KB`, "body");
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    return refusal(400, "body: not UTF-8 text", "body");
  }
  if (jsonDepth(text) > ACTION_MAX_DEPTH) return refusal(400, `body: nested more than ${ACTION_MAX_DEPTH} levels deep`, "body");
  try {
    JSON.parse(text);
  } catch {
    return refusal(400, "body: not valid JSON", "body");
  }
  return null;
}
