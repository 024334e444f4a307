// db/cluster.sh on a throwaway second cluster (its own temp folder and port; the main cluster is
// never touched): start is idempotent, and after stop nothing listens and no postmaster.pid is left.
import { execFile } from "node:child_process";
import { existsSync, mkdtempSync, chmodSync, rmSync } from "node:fs";
import net from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { promisify } from "node:util";

const run = promisify(execFile);
const SCRIPT = path.join(process.cwd(), "db", "cluster.sh");
const MAIN_PORT = Number(process.env.CHALKWING_PG_PORT ?? 54329);

let dir: string;
let port: number;
let env: NodeJS.ProcessEnv;

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.once("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const a = srv.address();
      srv.close(() => (a && typeof a === "object" ? resolve(a.port) : reject(new Error("no port"))));
    });
  });
}

function listening(p: number): Promise<boolean> {
  return new Promise((resolve) => {
    const s = net.connect({ host: "127.0.0.1", port: p });
    s.once("connect", () => {
      s.destroy();
      resolve(true);
    });
    s.once("error", () => resolve(false));
  });
}

const cluster = (cmd: string) => run("bash", [SCRIPT, cmd], { env, timeout: 90_000 });

beforeAll(async () => {
  dir = mkdtempSync(path.join(tmpdir(), "cw-pg-"));
  chmodSync(dir, 0o755); // the postgres user must reach the folder
  port = await freePort();
  if (port === MAIN_PORT) port += 1;
  env = { ...process.env, CHALKWING_PG_DIR: dir, CHALKWING_PG_PORT: String(port), CHALKWING_PG_FAST: "1" };
});

afterAll(async () => {
  if (dir) {
    await cluster("stop").catch(() => undefined);
    rmSync(dir, { recursive: true, force: true });
  }
});

test("start creates and starts a cluster in the given folder on the given port; a second start is a no-op", async () => {
  expect(await listening(port)).toBe(false);
  const first = await cluster("start");
  expect(first.stderr).toContain(`listening on 127.0.0.1:${port}`);
  expect(existsSync(path.join(dir, "data", "PG_VERSION"))).toBe(true);
  expect(existsSync(path.join(dir, "data", "postmaster.pid"))).toBe(true);
  expect(await listening(port)).toBe(true);
  const pidBefore = (await run("head", ["-n1", path.join(dir, "data", "postmaster.pid")])).stdout.trim();

  const second = await cluster("start");
  expect(second.stderr).toContain(`listening on 127.0.0.1:${port}`);
  const pidAfter = (await run("head", ["-n1", path.join(dir, "data", "postmaster.pid")])).stdout.trim();
  expect(pidAfter).toBe(pidBefore); // the same server, not a restart
  expect(await listening(port)).toBe(true);
  // the roles the app needs exist
  const roles = await run(
    "bash",
    [SCRIPT, "psql", "-c", "SELECT string_agg(rolname, ',' ORDER BY rolname) FROM pg_roles WHERE rolname LIKE 'chalkwing_%'"],
    { env },
  );
  expect(roles.stdout.trim()).toBe("chalkwing_app,chalkwing_owner");
  // the main cluster's folder was not used
  expect(dir.startsWith(path.join(process.cwd(), ".data"))).toBe(false);
});

test("stop leaves no listener and no postmaster.pid; a second stop is not an error", async () => {
  await cluster("stop");
  expect(await listening(port)).toBe(false);
  expect(existsSync(path.join(dir, "data", "postmaster.pid"))).toBe(false);
  await expect(cluster("stop")).resolves.toBeDefined();
  // and it starts again from the same folder
  await cluster("start");
  expect(await listening(port)).toBe(true);
  await cluster("stop");
  expect(await listening(port)).toBe(false);
});
