// Curve Lab rows of the authorisation table (spread into table.ts).
import type { AuthzTable, HarnessResponse } from "./types";
import { defaultSpec, type AirframeSnapshot } from "@/lib/curve-lab/demo-spec";

function rowIds(res: HarnessResponse): string[] {
  const j = res.json as { rows?: { id: string }[] } | undefined;
  if (!j || !Array.isArray(j.rows)) throw new Error(`expected { rows: [...] }, got ${res.text.slice(0, 200)}`);
  return j.rows.map((r) => r.id);
}

// An invented airframe, as a demo snapshots it (no profile id: a demo need not come from a stored profile).
const HARNESS_AIRFRAME: AirframeSnapshot = {
  id: null,
  name: "Harness trainer",
  emptyMassKg: 560,
  maxMassKg: 760,
  wingAreaM2: 11.6,
  wingSpanM: 9.8,
  oswaldEfficiency: 0.78,
  zeroLiftDragCoefficient: 0.032,
  configurations: { clean: { cd0Increment: 0, maxLiftCoefficient: 1.45 }, gearDown: null, flaps1: null, flaps2: null },
};

// The seeded motor glider's own numbers in the form's metric units, so a positive edit changes nothing.
const HERON_FORM = {
  name: "Fenmoor Heron (touring motor glider)",
  units: "metric",
  emptyMass: 420,
  maxMass: 620,
  wingArea: 15,
  wingSpan: 16.5,
  oswaldEfficiency: 0.85,
  zeroLiftDragCoefficient: 0.018,
  cleanMaxLiftCoefficient: 1.3,
  gearDown: { present: false, cd0Increment: 0, maxLiftCoefficient: 1.6 },
  flaps1: { present: false, cd0Increment: 0, maxLiftCoefficient: 1.6 },
  flaps2: { present: false, cd0Increment: 0, maxLiftCoefficient: 1.6 },
  notes: "Long wing, low zero-lift drag: a flat bucket. Invented type for ground teaching.",
};

const STAFF_ONLY = { signedOut: 401, student: 403, sponsor: 403 } as const;

export const CURVE_LAB_TABLE: AuthzTable = {
  "GET /api/demos": {
    expect: {
      signedOut: 401,
      chief: {
        status: 200,
        check: (res, fx) => expect(rowIds(res)).toEqual(expect.arrayContaining([fx.curveLabBucketDemo, fx.curveLabHeavyLightDemo])),
      },
      instructor: { status: 200, check: (res, fx) => expect(rowIds(res)).toContain(fx.curveLabBucketDemo) },
      // the Kestrel student sees the demo assigned to the Kestrel cohort, not the unassigned one
      student: {
        status: 200,
        check: (res, fx) => {
          expect(rowIds(res)).toContain(fx.curveLabBucketDemo);
          expect(res.text).not.toContain(fx.curveLabHeavyLightDemo);
        },
      },
      sponsor: 403,
    },
    secrets: (fx) => [fx.curveLabBucketDemo!, "Why drag has a bucket"],
  },
  "GET /api/airframes": {
    request: () => ({ query: "retired=include" }),
    expect: {
      ...STAFF_ONLY,
      chief: {
        status: 200,
        check: (res, fx) => expect(rowIds(res)).toEqual(expect.arrayContaining([fx.curveLabWrenAirframe, fx.curveLabHeronAirframe])),
      },
      instructor: { status: 200, check: (res, fx) => expect(rowIds(res)).toContain(fx.curveLabWrenAirframe) },
    },
    secrets: (fx) => [fx.curveLabWrenAirframe!, "Larkhollow Wren"],
  },

  "action app/(app)/curve-lab/actions.ts#saveDemoAction": {
    request: () => ({ args: [{ demoId: null, name: "Harness demo", spec: defaultSpec(HARNESS_AIRFRAME) }] }),
    expect: {
      ...STAFF_ONLY,
      chief: { status: 200, check: (res) => expect(res.json).toMatchObject({ ok: true, data: { revisionNumber: 1 } }) },
      instructor: { status: 200, check: (res) => expect(res.json).toMatchObject({ ok: true, data: { revisionNumber: 1 } }) },
    },
    mutates: true,
  },
  "action app/(app)/curve-lab/actions.ts#renameDemoAction": {
    // the same name: the owner (instructor) and the chief may rename; nothing visible changes
    request: (fx) => ({ args: [{ demoId: fx.curveLabHeavyLightDemo, name: "Heavy vs light: where Vmd moves" }] }),
    expect: { ...STAFF_ONLY, chief: 200, instructor: 200 },
    mutates: true,
  },
  "action app/(app)/curve-lab/actions.ts#duplicateDemoAction": {
    request: (fx) => ({ args: [{ demoId: fx.curveLabHeavyLightDemo }] }),
    expect: {
      ...STAFF_ONLY,
      chief: { status: 200, check: (res) => expect(res.json).toMatchObject({ ok: true, data: { revisionNumber: 1 } }) },
      instructor: 200,
    },
    mutates: true,
  },
  "action app/(app)/curve-lab/actions.ts#deleteDemoAction": {
    // the seeded demo is assigned to the Kestrel cohort: kept (409) even for its owner and the chief
    request: (fx) => ({ args: [{ demoId: fx.curveLabBucketDemo }] }),
    expect: { ...STAFF_ONLY, chief: 409, instructor: 409 },
  },
  "action app/(app)/curve-lab/actions.ts#makeCallAction": {
    request: (fx) => ({ args: [{ demoRevisionId: fx.curveLabBucketRevision, kind: "vmd", predictedMs: 35 }] }),
    expect: {
      signedOut: 401,
      chief: 403,
      instructor: 403,
      // one call per student and demo revision: a later call answers with the first call made (the demo seed's or this one)
      student: { status: 200, check: (res) => expect(res.json).toMatchObject({ ok: true, data: { predictedMs: expect.any(Number) } }) },
      sponsor: 403,
    },
    mutates: true,
  },

  "action app/(app)/curve-lab/airframes/actions.ts#createAirframeAction": {
    request: () => ({ args: [{ ...HERON_FORM, name: "Harness glider" }] }),
    expect: { ...STAFF_ONLY, chief: 200, instructor: 200 },
    mutates: true,
  },
  "action app/(app)/curve-lab/airframes/actions.ts#updateAirframeAction": {
    request: (fx) => ({ args: [{ airframeId: fx.curveLabHeronAirframe, values: HERON_FORM }] }),
    expect: {
      ...STAFF_ONLY,
      chief: { status: 200, check: (res) => expect(res.json).toMatchObject({ ok: true, data: { zeroLiftDragCoefficient: 0.018 } }) },
      instructor: 200,
    },
    mutates: true,
  },
  "action app/(app)/curve-lab/airframes/actions.ts#duplicateAirframeAction": {
    request: (fx) => ({ args: [{ airframeId: fx.curveLabHeronAirframe }] }),
    expect: { ...STAFF_ONLY, chief: 200, instructor: 200 },
    mutates: true,
  },
  "action app/(app)/curve-lab/airframes/actions.ts#retireAirframeAction": {
    // keeps the profile available (retired: false), so the positive calls change nothing visible
    request: (fx) => ({ args: [{ airframeId: fx.curveLabHeronAirframe, retired: false }] }),
    expect: { ...STAFF_ONLY, chief: 200, instructor: 200 },
    mutates: true,
  },
};
