// Derives the list of endpoints from the code, so nothing can be added without a table row:
//  - every exported HTTP method of every app/**/route.ts (parsed from the source), and
//  - every server action in the production build's server-reference-manifest.json.
import { existsSync, readdirSync, readFileSync } from "node:fs";
import path from "node:path";

export const METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE", "HEAD", "OPTIONS"] as const;
export type Method = (typeof METHODS)[number];

export interface RouteEndpoint {
  kind: "route";
  key: string; // "POST /api/people/[personId]/unlock"
  method: Method;
  path: string; // "/api/people/[personId]/unlock"
  file: string;
}

export interface ActionEndpoint {
  kind: "action";
  key: string; // "action app/(app)/today/actions.ts#unlockAccountAction"
  id: string;
  file: string;
  exportedName: string;
  /** app-dir paths of pages that can run the action, e.g. "/today" */
  pages: string[];
}

export type Endpoint = RouteEndpoint | ActionEndpoint;

function walk(dir: string, out: string[] = []): string[] {
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, e.name);
    if (e.isDirectory()) {
      if (e.name === "node_modules" || e.name.startsWith(".")) continue;
      walk(p, out);
    } else if (/^route\.(ts|tsx|js|mjs)$/.test(e.name)) out.push(p);
  }
  return out;
}

/** "app/(app)/x/[id]/route.ts" → "/x/[id]": route groups and parallel-route slots dropped. */
export function appPath(relFile: string): string {
  const parts = relFile.split(/[\\/]/).slice(1, -1); // drop "app" and the file name
  const kept = parts.filter((p) => !/^\(.*\)$/.test(p) && !p.startsWith("@"));
  return "/" + kept.join("/");
}

/** The HTTP methods a route file exports, from its source text. */
export function exportedMethods(source: string): Method[] {
  const found = new Set<Method>();
  const code = source.replace(/\/\*[\s\S]*?\*\//g, "").replace(/^\s*\/\/.*$/gm, "");
  const direct = /export\s+(?:const|let|var|async\s+function\*?|function\*?)\s+([A-Z]+)\b/g;
  for (const m of code.matchAll(direct)) if ((METHODS as readonly string[]).includes(m[1]!)) found.add(m[1] as Method);
  for (const m of code.matchAll(/export\s*\{([^}]*)\}/g)) {
    for (const spec of m[1]!.split(",")) {
      const name = spec
        .trim()
        .split(/\s+as\s+/)
        .pop()
        ?.trim();
      if (name && (METHODS as readonly string[]).includes(name)) found.add(name as Method);
    }
  }
  return METHODS.filter((x) => found.has(x));
}

export function deriveRoutes(root = process.cwd()): RouteEndpoint[] {
  const out: RouteEndpoint[] = [];
  for (const abs of walk(path.join(root, "app")).sort()) {
    const file = path.relative(root, abs).split(path.sep).join("/");
    const p = appPath(file);
    for (const method of exportedMethods(readFileSync(abs, "utf8")))
      out.push({ kind: "route", key: `${method} ${p}`, method, path: p, file });
  }
  return out;
}

interface ManifestEntry {
  workers: Record<string, unknown>;
  filename?: string;
  exportedName?: string;
}

export function manifestPath(root = process.cwd()): string {
  return path.join(root, process.env.CHALKWING_DIST_DIR || ".next", "server", "server-reference-manifest.json");
}

export function deriveActions(root = process.cwd()): ActionEndpoint[] {
  const file = manifestPath(root);
  if (!existsSync(file)) throw new Error(`${file} is missing: the e2e layer runs against a production build`);
  const manifest = JSON.parse(readFileSync(file, "utf8")) as { node?: Record<string, ManifestEntry>; edge?: Record<string, ManifestEntry> };
  const out: ActionEndpoint[] = [];
  for (const [id, entry] of [...Object.entries(manifest.node ?? {}), ...Object.entries(manifest.edge ?? {})]) {
    const fname = entry.filename ?? "(unknown file)";
    const exportedName = entry.exportedName ?? id;
    const pages = Object.keys(entry.workers)
      .filter((w) => w.startsWith("app/") && w.endsWith("/page"))
      .map((w) => appPath(`${w}.tsx`));
    out.push({ kind: "action", key: `action ${fname}#${exportedName}`, id, file: fname, exportedName, pages });
  }
  return out.sort((a, b) => a.key.localeCompare(b.key));
}

export function deriveEndpoints(root = process.cwd()): Endpoint[] {
  return [...deriveRoutes(root), ...deriveActions(root)];
}

/** "/api/x/[id]/[...rest]" with { id: "1", rest: "a/b" } → "/api/x/1/a/b". */
export function fillPath(p: string, params: Record<string, string> = {}, fallback?: string): string {
  return p.replace(/\[\[?(?:\.\.\.)?([^\]]+)\]?\]/g, (_m, name: string) => {
    const v = params[name] ?? fallback;
    if (v === undefined) throw new Error(`${p}: no value for the segment [${name}] (give it in request.params)`);
    return v.split("/").map(encodeURIComponent).join("/");
  });
}
