// db/cluster.sh from a checkout inside a folder nobody else may enter (like root's home, 0700 on
// Debian): the server's own user must still reach the cluster's data, start, status and stop must
// work, and nothing may be left listening or holding a postmaster.pid. Also: a port taken by
// another program is named in one plain sentence instead of PostgreSQL's own log.
import { execFile } from "node:child_process";
import { chmodSync, copyFileSync, existsSync, mkdirSync, mkdtempSync, rmSync } from "node:fs";
import net from "node:net";
import { tmpdir } from "node:os";
import path from "node:path";
import { promisify } from "node:util";

const run = promisify(execFile);
const MAIN_PORT = Number(process.env.CHALKWING_PG_PORT ?? 54329);

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

let home: string; // the closed folder (0700), like /root
let script: string; // db/cluster.sh of a checkout copy inside it
let port: number;
let env: NodeJS.ProcessEnv;
const cluster = (...args: string[]) => run("bash", [script, ...args], { env, timeout: 120_000 });

beforeAll(async () => {
  home = mkdtempSync(path.join(tmpdir(), "cw-home-"));
  chmodSync(home, 0o700);
  mkdirSync(path.join(home, "chalkwing", "db"), { recursive: true });
  script = path.join(home, "chalkwing", "db", "cluster.sh");
  copyFileSync(path.join(process.cwd(), "db", "cluster.sh"), script);
  port = await freePort();
  if (port === MAIN_PORT) port += 1;
  // no CHALKWING_PG_DIR: the script must choose a folder the server's user can reach by itself
  env = { ...process.env, CHALKWING_PG_PORT: String(port), CHALKWING_PG_FAST: "1" };
  delete env.CHALKWING_PG_DIR;
});

afterAll(async () => {
  await cluster("destroy").catch(() => undefined);
  rmSync(home, { recursive: true, force: true });
});

test("start, status and stop work from a checkout under a 0700 folder, and nothing is left running", async () => {
  const where = (await cluster("where")).stdout.trim();
  // two checkouts never share a cluster: the folder is named from this checkout's absolute path
  expect(where).not.toBe((await run("bash", [path.join(process.cwd(), "db", "cluster.sh"), "where"])).stdout.trim());

  const started = await cluster("start");
  expect(started.stderr).toContain(`listening on 127.0.0.1:${port}`);
  expect(started.stderr).toContain(where);
  expect(await listening(port)).toBe(true);
  await expect(cluster("status")).resolves.toBeDefined(); // exits 0 only when the server answers

  await cluster("stop");
  expect(await listening(port)).toBe(false);
  expect(existsSync(path.join(where, "data", "postmaster.pid"))).toBe(false);
  await expect(cluster("status")).rejects.toBeDefined();

  await cluster("destroy");
  expect(existsSync(where)).toBe(false);
});

test("a port held by another program is named in one plain sentence with what to do", async () => {
  const blocker = net.createServer();
  const taken = await freePort();
  await new Promise<void>((resolve) => blocker.listen(taken, "127.0.0.1", resolve));
  try {
    const failed = await run("bash", [script, "start"], { env: { ...env, CHALKWING_PG_PORT: String(taken) }, timeout: 120_000 }).then(
      () => null,
      (e: { stderr: string }) => e,
    );
    expect(failed).not.toBeNull();
    expect(failed!.stderr).toMatch(new RegExp(`could not listen on 127\\.0\\.0\\.1:${taken} because another program`));
    expect(failed!.stderr).toContain("CHALKWING_PG_PORT");
    expect(failed!.stderr).not.toMatch(/FATAL|LOG: /);
  } finally {
    await new Promise<void>((resolve) => blocker.close(() => resolve()));
    await run("bash", [script, "destroy"], { env: { ...env, CHALKWING_PG_PORT: String(taken) } }).catch(() => undefined);
  }
});
