import { render, screen, fireEvent } from "@testing-library/react";
import { CAUTION_TEXT } from "@/components/caution";
import { composeExport, exportMetaFor, EXPORT_WIDTH } from "@/components/charts/export-png";
import { defaultSpec, type AirframeSnapshot, type DemoSpec } from "./spec-fixture";

jest.mock("next/navigation", () => ({ useRouter: () => ({ push: jest.fn(), replace: jest.fn(), refresh: jest.fn() }) }));
jest.mock("@/app/(app)/curve-lab/actions", () => ({
  saveDemoAction: jest.fn(),
  renameDemoAction: jest.fn(),
  duplicateDemoAction: jest.fn(),
  deleteDemoAction: jest.fn(),
  makeCallAction: jest.fn(),
}));
const { DemoWorkbench } =
  // eslint-disable-next-line @typescript-eslint/no-require-imports
  require("@/app/(app)/curve-lab/_components/demo-workbench") as typeof import("@/app/(app)/curve-lab/_components/demo-workbench");

const kestrel: AirframeSnapshot = {
  id: "00000000-0000-4000-8000-000000000002",
  name: "Test Kestrel 2-seat",
  emptyMassKg: 560,
  maxMassKg: 760,
  wingAreaM2: 11.6,
  wingSpanM: 9.8,
  oswaldEfficiency: 0.78,
  zeroLiftDragCoefficient: 0.032,
  configurations: { clean: { cd0Increment: 0, maxLiftCoefficient: 1.45 }, gearDown: null, flaps1: null, flaps2: null },
};
const base = defaultSpec(kestrel);
const spec: DemoSpec = { ...base, cases: [base.cases[0]!, { ...base.cases[0]!, label: "Light, solo", massKg: 610 }] };

/** Every fillText on any canvas, in order. */
function recordText() {
  const drawn: string[] = [];
  const spy = jest.spyOn(CanvasRenderingContext2D.prototype, "fillText").mockImplementation(function (text: string) {
    drawn.push(text);
  });
  return { drawn, restore: () => spy.mockRestore() };
}

describe("the exported chart stands alone", () => {
  it("carries the title, the aircraft, every case, a legend entry per case and curve, the axes' units and the caution, 1600 px or wider", () => {
    const rec = recordText();
    const chartDraws: { w: number; light: boolean }[] = [];
    try {
      const out = composeExport((_ctx, box, o) => chartDraws.push({ w: box.w, light: o.light }), exportMetaFor("Why the bucket", spec), {
        light: true,
      });
      expect(out.canvas.width).toBe(EXPORT_WIDTH);
      expect(out.canvas.width).toBeGreaterThanOrEqual(1600);
      expect(chartDraws).toEqual([{ w: EXPORT_WIDTH - 96, light: true }]);
      const all = rec.drawn.join("\n");
      expect(rec.drawn[0]).toBe("Why the bucket");
      expect(all).toContain("Aircraft: Test Kestrel 2-seat");
      expect(all).toMatch(/Max mass: 760 kg, 0 ft, ISA \+0 K, clean/);
      expect(all).toMatch(/Light, solo: 610 kg/);
      expect(all).toContain("Light, solo: Total drag");
      expect(all).toContain("Max mass: Zero-lift drag");
      expect(all).toContain("Speed: EAS (= IAS = CAS here), kt · Drag: N");
      // the caution, wrapped over lines, word for word
      expect(out.texts.slice(-3).join(" ")).toContain(CAUTION_TEXT.slice(0, 60));
      expect(out.texts.join(" ").replace(/\s+/g, " ")).toContain(CAUTION_TEXT);
      expect(out.texts).toEqual(rec.drawn);
    } finally {
      rec.restore();
    }
  });

  it("the builder's export button draws the real chart into the composition, on white when asked, and downloads it", () => {
    const original = URL.createObjectURL;
    const blobs: Blob[] = [];
    URL.createObjectURL = ((b: Blob) => (blobs.push(b), "blob:x")) as typeof URL.createObjectURL;
    const names: string[] = [];
    const click = jest.spyOn(HTMLAnchorElement.prototype, "click").mockImplementation(function (this: HTMLAnchorElement) {
      names.push(this.download);
    });
    const rec = recordText();
    try {
      render(
        <DemoWorkbench
          mode="builder"
          demoId={null}
          demoRevisionId={null}
          revisionNumber={null}
          name="Why the bucket"
          initialSpec={spec}
          airframes={[kestrel]}
        />,
      );
      fireEvent.click(screen.getByTestId("export-paper"));
      rec.drawn.length = 0;
      fireEvent.click(screen.getByRole("button", { name: "Export chart (PNG)" }));
      expect(names).toEqual(["Why the bucket (paper).png"]);
      expect(blobs[0]!.type).toBe("image/png");
      expect(rec.drawn[0]).toBe("Why the bucket");
      expect(rec.drawn).toContain("Aircraft: Test Kestrel 2-seat");
      // the chart's own labels are drawn too (every case is named on the chart)
      expect(rec.drawn).toContain("Light, solo");
      expect(rec.drawn.join(" ")).toContain("For ground teaching only");
    } finally {
      rec.restore();
      click.mockRestore();
      URL.createObjectURL = original;
    }
  });
});
