import { render, screen, fireEvent, within } from "@testing-library/react";
import { defaultSpec, type AirframeSnapshot } from "./spec-fixture";

jest.mock("next/navigation", () => ({ useRouter: () => ({ push: jest.fn(), replace: jest.fn(), refresh: jest.fn() }) }));
const actions = {
  saveDemoAction: jest.fn(),
  renameDemoAction: jest.fn(),
  duplicateDemoAction: jest.fn(),
  deleteDemoAction: jest.fn(),
  makeCallAction: jest.fn(),
};
jest.mock("@/app/(app)/curve-lab/actions", () => actions);
const { DemoWorkbench, massForNewAirframe } =
  // eslint-disable-next-line @typescript-eslint/no-require-imports
  require("@/app/(app)/curve-lab/_components/demo-workbench") as typeof import("@/app/(app)/curve-lab/_components/demo-workbench");

const small: AirframeSnapshot = {
  id: "00000000-0000-4000-8000-000000000001",
  name: "Small trainer",
  emptyMassKg: 560,
  maxMassKg: 760,
  wingAreaM2: 11.6,
  wingSpanM: 9.8,
  oswaldEfficiency: 0.78,
  zeroLiftDragCoefficient: 0.032,
  configurations: { clean: { cd0Increment: 0, maxLiftCoefficient: 1.45 }, gearDown: null, flaps1: null, flaps2: null },
};
const tourer: AirframeSnapshot = {
  ...small,
  id: "00000000-0000-4000-8000-000000000002",
  name: "Tourer",
  emptyMassKg: 700,
  maxMassKg: 1150,
};

function renderBuilder() {
  return render(
    <DemoWorkbench
      mode="builder"
      demoId={null}
      demoRevisionId={null}
      revisionNumber={null}
      name="Test"
      initialSpec={defaultSpec(small)}
      airframes={[small, tourer]}
    />,
  );
}

describe("builder details", () => {
  beforeEach(() => jest.clearAllMocks());

  // 760 kg is inside the tourer's range too, so keeping the mass would leave a "Max mass" case at the small trainer's maximum
  it("switching the aircraft moves a 'Max mass' case to the new aircraft's maximum mass", () => {
    renderBuilder();
    const kase = screen.getByTestId("case-0");
    expect(within(kase).getByLabelText(/^Label/)).toHaveValue("Max mass");
    expect(within(kase).getByTestId("mass-0")).toHaveValue("760");
    fireEvent.change(screen.getByLabelText("Airframe"), { target: { value: tourer.id } });
    expect(within(kase).getByTestId("mass-0")).toHaveValue("1150");
    expect(within(kase).getByText(/1,150 kg/)).toBeInTheDocument();
    // and back again
    fireEvent.change(screen.getByLabelText("Airframe"), { target: { value: small.id } });
    expect(within(kase).getByTestId("mass-0")).toHaveValue("760");
  });

  it("a mass between empty and maximum keeps its place in the new aircraft's range", () => {
    expect(massForNewAirframe(660, small, tourer)).toBe(925); // half way: 700 + 0.5 x 450
    expect(massForNewAirframe(560, small, tourer)).toBe(700);
    expect(massForNewAirframe(760, small, tourer)).toBe(1150);
  });

  it("a demo name over 120 characters is kept whole, refused with a message naming the field and the limit, and not sent", () => {
    renderBuilder();
    const long = "A very long demo name ".repeat(7).trim(); // 153 characters
    fireEvent.change(screen.getByLabelText("Demo name"), { target: { value: long } });
    expect(screen.getByLabelText("Demo name")).toHaveValue(long);
    expect(screen.getByTestId("demo-name-error")).toHaveTextContent(`Demo name: at most 120 characters (this one has ${long.length})`);
    fireEvent.click(screen.getByTestId("save-demo"));
    expect(actions.saveDemoAction).not.toHaveBeenCalled();
    expect(screen.getByTestId("demo-status")).toHaveTextContent("Demo name: at most 120 characters");
  });
});
