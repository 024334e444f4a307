// The Content-Security-Policy of every page, with a fresh nonce per request (set by proxy.ts).
// Scripts run only when they carry the nonce (Next.js puts it on its own scripts, reading it
// from the request's Content-Security-Policy header) or are loaded by one that does
// ('strict-dynamic'); an injected inline script has no nonce and is blocked. No 'unsafe-inline'.
// Pure and runtime-neutral: proxy.ts and next.config.ts both read it.

export function pageCsp(nonce: string, dev = process.env.NODE_ENV !== "production"): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ""}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join("; ");
}

/** For responses the proxy does not see (route handlers): no script at all. */
export const API_CSP = "default-src 'self'; script-src 'none'; object-src 'none'; base-uri 'self'; frame-ancestors 'none'";

/** A nonce: 128 random bits, base64. */
export function newNonce(): string {
  const bytes = new Uint8Array(16);
  crypto.getRandomValues(bytes);
  return btoa(String.fromCharCode(...bytes));
}
