import { render, screen, fireEvent, waitFor } from "@testing-library/react";
import { ktToMs } from "@/lib/aero";
import { defaultSpec, type AirframeSnapshot, type DemoSpec } from "./spec-fixture";

jest.mock("next/navigation", () => ({ useRouter: () => ({ push: jest.fn(), replace: jest.fn(), refresh: jest.fn() }) }));
const actions = {
  saveDemoAction: jest.fn(),
  renameDemoAction: jest.fn(),
  duplicateDemoAction: jest.fn(),
  deleteDemoAction: jest.fn(),
  makeCallAction: jest.fn(),
};
jest.mock("@/app/(app)/curve-lab/actions", () => actions);

const { DemoWorkbench } =
  // eslint-disable-next-line @typescript-eslint/no-require-imports
  require("@/app/(app)/curve-lab/_components/demo-workbench") as typeof import("@/app/(app)/curve-lab/_components/demo-workbench");

const trainer: AirframeSnapshot = {
  id: "00000000-0000-4000-8000-000000000001",
  name: "Test trainer",
  emptyMassKg: 560,
  maxMassKg: 760,
  wingAreaM2: 11.6,
  wingSpanM: 9.8,
  oswaldEfficiency: 0.78,
  zeroLiftDragCoefficient: 0.032,
  configurations: { clean: { cd0Increment: 0, maxLiftCoefficient: 1.45 }, gearDown: null, flaps1: null, flaps2: null },
};
const spec: DemoSpec = { ...defaultSpec(trainer), callKind: "vmd" };
const REVISION = "00000000-0000-4000-8000-0000000000aa";

describe("Call it first in the student's view", () => {
  beforeEach(() => jest.clearAllMocks());

  it("the reveal's gap is the difference of the two numbers it prints (62 kt, 70 kt: 8 kt slow)", async () => {
    actions.makeCallAction.mockResolvedValue({
      ok: true,
      data: { id: "c1", predictedMs: ktToMs(62.4), actualMs: ktToMs(70.49), errorMs: ktToMs(62.4) - ktToMs(70.49), alreadyMade: false },
    });
    render(<DemoWorkbench mode="student" demoId="d" demoRevisionId={REVISION} revisionNumber={1} name="Demo" initialSpec={spec} />);
    fireEvent.change(screen.getByLabelText(/^Speed \(kt\)/), { target: { value: "62.4" } });
    fireEvent.click(screen.getByTestId("make-call"));
    await waitFor(() => expect(screen.getByTestId("call-result").textContent).toContain("answer 70 kt"));
    const text = screen.getByTestId("call-result").textContent!.replace(/\s+/g, " ");
    expect(text).toContain("Your call 62 kt · answer 70 kt · you were 8 kt slow.");
    expect(text).not.toContain("8.1");
  });

  it("with a call already made on this revision it opens on the result: no prompt, the call button off, the readouts shown", () => {
    render(
      <DemoWorkbench
        mode="student"
        demoId="d"
        demoRevisionId={REVISION}
        revisionNumber={2}
        name="Demo"
        initialSpec={spec}
        priorCall={{ predictedMs: ktToMs(65), actualMs: ktToMs(70) }}
        earlierCalls={[
          {
            id: "c2",
            revisionNumber: 2,
            kind: "vmd",
            predictedMs: ktToMs(65),
            actualMs: ktToMs(70),
            answerFlag: "",
            createdAt: "2026-11-03T10:00:00Z",
          },
          // an earlier revision whose answer lay below the stall: its validity words stay beside it
          {
            id: "c1",
            revisionNumber: 1,
            kind: "vmd",
            predictedMs: ktToMs(80),
            actualMs: ktToMs(71),
            answerFlag: "below stall: model not valid",
            createdAt: "2026-10-01T10:00:00Z",
          },
        ]}
      />,
    );
    expect(screen.getByTestId("call-result").textContent).toContain("Your call 65 kt · answer 70 kt");
    expect(screen.getByTestId("make-call")).toBeDisabled();
    expect(screen.queryByText("Readouts appear after your call.")).toBeNull();
    expect(screen.getByTestId("readout-vmd")).toBeInTheDocument();
    const own = screen.getByTestId("own-calls").textContent!;
    expect(own).toContain("Revision 1, Vmd: your call 80 kt, answer 71 kt (below stall: model not valid), 9 kt fast");
    expect(own).toContain("Revision 2, Vmd: your call 65 kt, answer 70 kt, 5 kt slow");
    expect(actions.makeCallAction).not.toHaveBeenCalled();
  });
});
