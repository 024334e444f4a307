import { render, screen } from "@testing-library/react";
import { validityText } from "@/lib/aero";
import { defaultSpec, type AirframeSnapshot } from "./spec-fixture";

// The chart itself is not under test here: a stub keeps chart.js out of jsdom.
jest.mock("@/components/charts/curve-chart", () => ({
  CASE_COLOURS: ["#f4f1e8", "#7fd1ff", "#ffb3c7", "#c8f07a"],
  CurveChart: () => null,
}));

// loaded after the mock above
const { ProjectorView } =
  // eslint-disable-next-line @typescript-eslint/no-require-imports
  require("@/app/(app)/curve-lab/_components/projector-view") as typeof import("@/app/(app)/curve-lab/_components/projector-view");

const trainer = (cleanMaxLift: number): AirframeSnapshot => ({
  id: "00000000-0000-4000-8000-000000000001",
  name: "Test trainer",
  emptyMassKg: 560,
  maxMassKg: 760,
  wingAreaM2: 11.6,
  wingSpanM: 9.8,
  oswaldEfficiency: 0.78,
  zeroLiftDragCoefficient: 0.032,
  configurations: {
    clean: { cd0Increment: 0, maxLiftCoefficient: cleanMaxLift },
    gearDown: null,
    flaps1: null,
    flaps2: null,
  },
});

const BELOW_STALL = validityText(["below_stall"]);

describe("Projector view readouts carry the lib/aero validity flags", () => {
  it("shows Vmd and Vmp bare when both are above the stall", () => {
    // CL at Vmd = sqrt(CD0/k) = 0.81 and at Vmp sqrt(3) x 0.81 = 1.40, both under CLmax 1.45 (lib/aero/README.md)
    render(<ProjectorView name="Valid" spec={defaultSpec(trainer(1.45))} backHref="/curve-lab" />);
    expect(screen.getByTestId("projector-vmd").textContent).toMatch(/^Vmd \d+ kt$/);
    expect(screen.getByTestId("projector-vmp").textContent).toMatch(/^Vmp \d+ kt$/);
  });

  it("flags Vmp alone when only Vmp needs more lift than CLmax", () => {
    render(<ProjectorView name="Vmp below stall" spec={defaultSpec(trainer(1.2))} backHref="/curve-lab" />);
    expect(screen.getByTestId("projector-vmd").textContent).toMatch(/^Vmd \d+ kt$/);
    expect(screen.getByTestId("projector-vmp").textContent).toMatch(new RegExp(`^Vmp \\d+ kt \\(${BELOW_STALL}\\)$`));
  });

  it("flags both when Vmd itself is below the stall", () => {
    render(<ProjectorView name="Both below stall" spec={defaultSpec(trainer(0.5))} backHref="/curve-lab" />);
    expect(screen.getByTestId("projector-vmd").textContent).toContain(`(${BELOW_STALL})`);
    expect(screen.getByTestId("projector-vmp").textContent).toContain(`(${BELOW_STALL})`);
  });
});
