import { render, screen, within } from "@testing-library/react";
import { minimumDragSpeed, stallSpeed, validityText } from "@/lib/aero";
import { aircraftFor, defaultSpec, type AirframeSnapshot } from "@/lib/curve-lab/demo-spec";
import { callAnswerFlag, caseFigures, flaggedLiftToDrag, stallByConfiguration, whatIf } from "@/lib/curve-lab/readouts";
import { fillFrame, newFrame } from "@/lib/curve-lab/chart-frame";

// Issue 12 leftover, "numbers never silently out of range": the aircraft profile page shows lib/aero's
// validity words beside each computed speed, as the demo readouts do; so do the stall readout, the
// (L/D)max ratio, the what-if lines, the Call it answer and the chart's marker labels.

/** What the page reads of a profile (db/access/curve-lab/airframes.ts, AirframeView). */
type Profile = Omit<AirframeSnapshot, "id"> & { id: string; notes: string; retiredAt: string | null; updatedAt: string };

const profile: Profile = {
  id: "00000000-0000-4000-8000-0000000000b1",
  name: "Test profile",
  emptyMassKg: 600,
  maxMassKg: 1000,
  wingAreaM2: 15,
  wingSpanM: 10,
  oswaldEfficiency: 0.75,
  zeroLiftDragCoefficient: 0.027,
  configurations: {
    clean: { cd0Increment: 0, maxLiftCoefficient: 1.5 },
    gearDown: null,
    flaps1: { cd0Increment: 0.02, maxLiftCoefficient: 1.8 },
    flaps2: null,
  },
  notes: "",
  retiredAt: null,
  updatedAt: "2026-11-01T00:00:00.000Z",
};
// An invented airframe whose clean Vmd lies below its stall: very high CD0 with a low CLmax.
const brick: Profile = {
  ...profile,
  name: "Test brick",
  wingSpanM: 6,
  oswaldEfficiency: 0.7,
  zeroLiftDragCoefficient: 0.3,
  configurations: { ...profile.configurations, clean: { cd0Increment: 0, maxLiftCoefficient: 0.6 }, flaps1: null },
};
// Heavy with a small wing: Vmd TAS high up is above Mach 0.3 (the jet case of tests/unit/aero/validity.test.ts)
const heavy: Profile = {
  ...profile,
  name: "Test heavy",
  emptyMassKg: 30000,
  maxMassKg: 60000,
  wingAreaM2: 40,
  wingSpanM: 20,
  oswaldEfficiency: 0.7,
  zeroLiftDragCoefficient: 0.02,
  configurations: { ...profile.configurations, flaps1: null },
};

let current: Profile = profile;
jest.mock("@/lib/auth/guard", () => ({
  requirePagePermission: jest.fn(async () => ({ id: "u", name: "Chief", roles: [], schoolId: "s" })),
  can: () => false,
}));
jest.mock("@/db/access/curve-lab/airframes", () => ({ getAirframe: jest.fn(async () => current) }));
jest.mock("@/app/(app)/curve-lab/airframes/_components/airframe-actions", () => ({ AirframeButtons: () => null }));
jest.mock("next/navigation", () => ({
  notFound: () => {
    throw new Error("not found");
  },
}));
// loaded after the mocks above
const { default: AirframePage } =
  // eslint-disable-next-line @typescript-eslint/no-require-imports
  require("@/app/(app)/curve-lab/airframes/[airframeId]/page") as typeof import("@/app/(app)/curve-lab/airframes/[airframeId]/page");

async function renderPage(a: Profile, query: Record<string, string> = {}) {
  current = a;
  render(await AirframePage({ params: Promise.resolve({ airframeId: a.id }), searchParams: Promise.resolve(query) }));
  const table = screen.getByTestId("derived-figures");
  const row = (name: string) => within(table).getByRole("cell", { name }).closest("tr")!.textContent!.replace(/\s+/g, " ");
  return { table, row };
}

const BELOW_STALL = validityText(["below_stall"]);
const MACH = validityText(["compressible"]);

describe("the aircraft profile page", () => {
  it("shows a trainer's figures bare (all inside the model's validity)", async () => {
    const { table } = await renderPage(profile);
    expect(table.textContent).not.toMatch(/stall: model not valid|Mach 0\.3|meaningless/);
  });

  it("flags Vmd, Vmp, best glide and (L/D)max when Vmd is below the stall, in both columns", async () => {
    const snap: AirframeSnapshot = { ...brick, id: brick.id };
    const c = { label: "", massKg: brick.maxMassKg, altitudeM: 0, isaDeviationK: 0, configuration: "clean" as const };
    const a = aircraftFor(snap, c);
    expect(minimumDragSpeed(a, { altitudeM: 0 }).equivalentAirspeedMs).toBeLessThan(stallSpeed(a, { altitudeM: 0 }).equivalentAirspeedMs);
    const { row } = await renderPage(brick);
    for (const name of ["Vmd", "Vmp", "Best glide"])
      expect(row(name)).toMatch(new RegExp(`^${name}\\d+ kt \\(${BELOW_STALL}\\)\\d+ kt \\(${BELOW_STALL}\\)$`));
    expect(row("(L/D)max (= best glide ratio)")).toContain(`(at Vmd: ${BELOW_STALL})`);
    // the stall speed itself is where CL = CLmax: valid
    expect(row("Stall speed, clean")).toMatch(/^Stall speed, clean\d+ kt\d+ kt$/);
  });

  it("flags a speed above Mach 0.3; a trainer at the same altitude stays bare", async () => {
    // 60,000 kg at 36,000 ft: Vmd TAS is well above Mach 0.3 (a = 573 kt there, ISA)
    const high = await renderPage(heavy, { massLb: "132277", altitudeFt: "36000" });
    expect(high.row("Vmd")).toMatch(new RegExp(`^Vmd\\d+ kt \\(${MACH}\\)\\d+ kt \\(${MACH}\\)$`));
    document.body.innerHTML = "";
    const trainer = await renderPage(profile, { altitudeFt: "36000" });
    expect(trainer.table.textContent).not.toContain(MACH);
  });
});

describe("the other screens' computed numbers carry the same words", () => {
  const snap: AirframeSnapshot = { ...brick };
  const c = { label: "A", massKg: 900, altitudeM: 0, isaDeviationK: 0, configuration: "clean" as const };

  it("(L/D)max reads with Vmd's flag; the stall speed has none at CL = CLmax", () => {
    const f = caseFigures(snap, c, "equivalent");
    expect(flaggedLiftToDrag(f)).toMatch(new RegExp(`^\\d+\\.\\d \\(at Vmd: ${BELOW_STALL}\\)$`));
    expect(f.flags.stall).toBe("");
    expect(stallByConfiguration(snap, c, "true").map((s) => s.flag)).toEqual([""]);
    const trainer = caseFigures({ ...profile }, { ...c, massKg: 1000 }, "equivalent");
    expect(flaggedLiftToDrag(trainer)).toMatch(/^\d+\.\d$/);
  });

  it("the what-if lines and the Call it answer say when Vmd is out of the model", () => {
    const spec = { ...defaultSpec(snap), cases: [c] };
    expect(whatIf(spec, 0)[0]).toMatch(new RegExp(`from \\d+ kt \\(${BELOW_STALL}\\) to \\d+ kt \\(${BELOW_STALL}\\)`));
    expect(callAnswerFlag({ ...spec, callKind: "vmd" }, "vmd")).toBe(BELOW_STALL);
    expect(callAnswerFlag({ ...spec, callKind: "stall" }, "stall")).toBe("");
    const fine = { ...defaultSpec({ ...profile }), callKind: "vmd" as const };
    expect(callAnswerFlag(fine, "vmd")).toBe("");
  });

  it("the chart frame carries the flags its Vmd, Vmp and stall labels print", () => {
    const frame = fillFrame(newFrame(), { ...defaultSpec(snap), cases: [c] }, {});
    expect(frame.cases[0]!.flags).toEqual({ vmd: BELOW_STALL, vmp: BELOW_STALL, stall: "" });
    const ok = fillFrame(newFrame(), defaultSpec({ ...profile }), {});
    expect(ok.cases[0]!.flags).toEqual({ vmd: "", vmp: "", stall: "" });
  });
});
