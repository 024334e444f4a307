// Curve Lab fixtures: the seeded aircraft profiles and demos (db/seed/curve-lab.ts), by name.
export const CURVE_LAB_LOOKUPS: Record<string, { sql: string; params?: unknown[] }> = {
  curveLabBucketDemo: { sql: `SELECT id FROM demos WHERE name = $1 AND deleted_at IS NULL`, params: ["Why drag has a bucket"] },
  curveLabBucketRevision: {
    sql: `SELECT current_revision_id AS id FROM demos WHERE name = $1 AND deleted_at IS NULL`,
    params: ["Why drag has a bucket"],
  },
  curveLabHeavyLightDemo: {
    sql: `SELECT id FROM demos WHERE name = $1 AND deleted_at IS NULL`,
    params: ["Heavy vs light: where Vmd moves"],
  },
  curveLabWrenAirframe: { sql: `SELECT id FROM airframes WHERE name = $1`, params: ["Larkhollow Wren LW-2 (two-seat trainer)"] },
  curveLabHeronAirframe: { sql: `SELECT id FROM airframes WHERE name = $1`, params: ["Fenmoor Heron (touring motor glider)"] },
};
