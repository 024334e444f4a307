import { render, screen, fireEvent, within } from "@testing-library/react";
import { Chart } from "chart.js";
import { minimumDragSpeed, msToKt, ftToM, stallSpeed } from "@/lib/aero";
import { defaultSpec, aircraftFor, type AirframeSnapshot, type DemoSpec } from "./spec-fixture";

jest.mock("next/navigation", () => ({ useRouter: () => ({ push: jest.fn(), replace: jest.fn(), refresh: jest.fn() }) }));
const actions = {
  saveDemoAction: jest.fn(),
  renameDemoAction: jest.fn(),
  duplicateDemoAction: jest.fn(),
  deleteDemoAction: jest.fn(),
  makeCallAction: jest.fn(),
};
jest.mock("@/app/(app)/curve-lab/actions", () => actions);

// loaded after the mocks above
const { DemoWorkbench } =
  // eslint-disable-next-line @typescript-eslint/no-require-imports
  require("@/app/(app)/curve-lab/_components/demo-workbench") as typeof import("@/app/(app)/curve-lab/_components/demo-workbench");

const wren: AirframeSnapshot = {
  id: "00000000-0000-4000-8000-000000000001",
  name: "Test trainer",
  emptyMassKg: 560,
  maxMassKg: 760,
  wingAreaM2: 11.6,
  wingSpanM: 9.8,
  oswaldEfficiency: 0.78,
  zeroLiftDragCoefficient: 0.032,
  configurations: {
    clean: { cd0Increment: 0, maxLiftCoefficient: 1.45 },
    gearDown: null,
    flaps1: { cd0Increment: 0.012, maxLiftCoefficient: 1.75 },
    flaps2: { cd0Increment: 0.035, maxLiftCoefficient: 2.05 },
  },
};

function libraryVmdKt(spec: DemoSpec, massKg: number, altitudeM = 0): string {
  const c = { ...spec.cases[0]!, massKg, altitudeM };
  return `${msToKt(minimumDragSpeed(aircraftFor(spec.airframe, c), { altitudeM, isaDeviationK: 0 }).equivalentAirspeedMs).toFixed(0)} kt`;
}

function renderBuilder(spec: DemoSpec) {
  return render(
    <DemoWorkbench
      mode="builder"
      demoId={null}
      demoRevisionId={null}
      revisionNumber={null}
      name="Test"
      initialSpec={spec}
      airframes={[wren]}
    />,
  );
}

describe("demo builder", () => {
  beforeEach(() => jest.clearAllMocks());

  it("moving the mass slider changes the Vmd readout to lib/aero's value and redraws the same chart once", () => {
    const spec = defaultSpec(wren);
    renderBuilder(spec);
    expect(screen.getByTestId("readout-vmd")).toHaveTextContent(libraryVmdKt(spec, 760));

    const canvas = screen.getByTestId("curve-chart") as HTMLCanvasElement;
    const chart = Chart.getChart(canvas)!;
    expect(chart).toBeDefined();
    const chartId = canvas.dataset.chartId;
    const rendersBefore = Number(canvas.dataset.renders);

    fireEvent.change(screen.getByTestId("mass-0"), { target: { value: "600" } });

    // The readout is the library's own Vmd at 600 kg (a different number from 760 kg's).
    expect(screen.getByTestId("readout-vmd")).toHaveTextContent(libraryVmdKt(spec, 600));
    expect(libraryVmdKt(spec, 600)).not.toEqual(libraryVmdKt(spec, 760));
    // Same chart instance, one redraw for one input, the total-drag data rewritten in place.
    expect(Chart.getChart(canvas)).toBe(chart);
    expect(canvas.dataset.chartId).toBe(chartId);
    expect(Number(canvas.dataset.renders)).toBe(rendersBefore + 1);
    // only the drawn curves are in the chart: zero-lift, lift-dependent and total drag of the one case
    expect(chart.data.datasets.map((d) => d.label)).toEqual([
      "Zero-lift drag, case 1",
      "Lift-dependent drag, case 1",
      "Total drag, case 1",
    ]);
    const total = chart.data.datasets.find((d) => d.label === "Total drag, case 1")!.data as { x: number; y: number }[];
    expect(total).toHaveLength(400);
    // Lowest sampled total drag ≈ W / (L/D)max at 600 kg (the sampled minimum sits within 1 % of it).
    const minDrag = Math.min(...total.map((p) => p.y));
    const dmin = minimumDragSpeed(aircraftFor(spec.airframe, { ...spec.cases[0]!, massKg: 600 }), { altitudeM: 0 }).totalDragN;
    expect(Math.abs(minDrag - dmin) / dmin).toBeLessThan(0.01);
  });

  it("altitude moves Vmd on the TAS axis but not on the EAS axis, as the library says", () => {
    const spec: DemoSpec = { ...defaultSpec(wren), axis: { speed: "equivalent", unit: "kt" } };
    renderBuilder(spec);
    const chart = Chart.getChart(screen.getByTestId("curve-chart") as HTMLCanvasElement)!;
    const xTitle = () => (chart.options.scales!.x as { title: { text: string } }).title.text;
    expect(xTitle()).toBe("EAS (= IAS = CAS here) (kt)");
    expect(chart.scales.x!.max).toBeCloseTo(msToKt(spec.range.maxSpeedMs), 6);
    fireEvent.change(screen.getByLabelText(/Pressure altitude, case 1/), { target: { value: "8000" } });
    expect(screen.getByTestId("readout-vmd")).toHaveTextContent(libraryVmdKt(spec, 760));
    fireEvent.click(screen.getByLabelText("TAS"));
    const tas = minimumDragSpeed(aircraftFor(spec.airframe, spec.cases[0]!), { altitudeM: ftToM(8000) }).trueAirspeedMs;
    expect(screen.getByTestId("readout-vmd")).toHaveTextContent(`${msToKt(tas).toFixed(0)} kt`);
    expect(xTitle()).toBe("TAS (kt)");
    expect(Chart.getChart(screen.getByTestId("curve-chart") as HTMLCanvasElement)).toBe(chart);
  });

  it("the configuration changes the stall readout to the library's value for that CLmax", () => {
    const spec = defaultSpec(wren);
    renderBuilder(spec);
    const kase = screen.getByTestId("case-0");
    fireEvent.change(within(kase).getByLabelText(/Configuration, case 1/), { target: { value: "flaps2" } });
    const vs = stallSpeed(aircraftFor(spec.airframe, { ...spec.cases[0]!, configuration: "flaps2" }), {
      altitudeM: 0,
    }).equivalentAirspeedMs;
    expect(screen.getByTestId("readout-stall")).toHaveTextContent(`${msToKt(vs).toFixed(0)} kt`);
  });

  it("exports the chart as a PNG file right after the page loads (no slider moved first)", () => {
    const created: Blob[] = [];
    const original = URL.createObjectURL;
    URL.createObjectURL = ((b: Blob) => {
      created.push(b);
      return "blob:chart";
    }) as typeof URL.createObjectURL;
    const clicks: string[] = [];
    const click = jest.spyOn(HTMLAnchorElement.prototype, "click").mockImplementation(function (this: HTMLAnchorElement) {
      clicks.push(this.download);
    });
    try {
      renderBuilder(defaultSpec(wren));
      fireEvent.click(screen.getByRole("button", { name: "Export chart (PNG)" }));
      expect(clicks).toEqual(["Test.png"]);
      expect(created).toHaveLength(1);
      expect(created[0]!.type).toBe("image/png");
    } finally {
      click.mockRestore();
      URL.createObjectURL = original;
    }
  });

  it("the power axis exists only while the power-required curve is drawn, on the same chart", () => {
    renderBuilder(defaultSpec(wren));
    const canvas = screen.getByTestId("curve-chart") as HTMLCanvasElement;
    const chart = Chart.getChart(canvas)!;
    expect(chart.scales.power).toBeUndefined();
    fireEvent.click(screen.getByLabelText("Power required"));
    expect(Chart.getChart(canvas)).toBe(chart);
    expect(chart.scales.power).toBeDefined();
    expect(chart.data.datasets.map((d) => d.label)).toContain("Power required, case 1");
    fireEvent.click(screen.getByLabelText("Power required"));
    expect(chart.scales.power).toBeUndefined();
    expect(chart.data.datasets.map((d) => d.label)).not.toContain("Power required, case 1");
  });
});
