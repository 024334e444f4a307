// Where to go after signing in: only a path on this site. `next` comes from the address bar, so
// anything that a browser could read as another host is refused: `//evil`, `/\evil` (browsers
// treat a backslash as a slash), tabs or newlines inside (browsers drop them, so `/\t/evil` is
// `//evil`), `javascript:` and absolute URLs. Pure: used by the sign-in page, its form and the proxy.

export const DEFAULT_NEXT_PATH = "/today";
const BASE = "http://chalkwing.invalid";

export function safeNextPath(raw: unknown, fallback = DEFAULT_NEXT_PATH): string {
  if (typeof raw !== "string" || raw.length === 0 || raw.length > 2000) return fallback;
  if (!raw.startsWith("/") || raw.startsWith("//")) return fallback;
  // backslashes and control characters (including tab, CR, LF) never belong in our paths
  if (/[\\\u0000-\u001f\u007f]/.test(raw)) return fallback;
  let url: URL;
  try {
    url = new URL(raw, BASE);
  } catch {
    return fallback;
  }
  if (url.origin !== BASE) return fallback;
  const path = `${url.pathname}${url.search}${url.hash}`;
  return path.startsWith("//") ? fallback : path;
}
