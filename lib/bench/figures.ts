import type { Role } from "./endpoints";

/** One endpoint at one size: a single request first, then autocannon's figures (null when it errored first). */
export interface Figure {
  name: string;
  role: Role | null;
  path: string;
  status: number;
  bytes: number;
  singleMs: number;
  error: string | null;
  load: {
    connections: number;
    /** "10 s" (autocannon's duration) or "64 requests" (a slow endpoint loaded by count) */
    mode: string;
    requests: number;
    rps: number;
    p50: number;
    p97_5: number;
    p99: number;
    non2xx: number;
    errors: number;
    timeouts: number;
  } | null;
}

/** Every figure of one size, with `/api/health` measured on the same server in the same run. */
export interface SizeRun {
  students: number;
  measuredAt: string;
  seconds: number;
  connections: number;
  /** the machine's 1-minute load average before and after the size's measurements */
  loadAverage: [number, number];
  signInErrors: string[];
  /** `/api/health`: the mean of the runs before and after the endpoints (healthRuns) */
  health: Figure;
  healthRuns: Figure[];
  /**
   * The sign-in page signed out: the smallest page the framework renders (no session, no database
   * read), the floor under every page's figure. Absent in runs made before it was measured.
   */
  floor?: Figure;
  figures: Figure[];
}
