import { render, screen, fireEvent, waitFor } from "@testing-library/react";
import { defaultSpec, type AirframeSnapshot, type DemoSpec } from "./spec-fixture";

// Every Curve Lab create sends one idempotency key per form instance: a retried submit (same
// form, after a failure) repeats the key, so the server creates nothing twice; after a success
// the next submit gets a fresh key.

jest.mock("next/navigation", () => ({ useRouter: () => ({ push: jest.fn(), replace: jest.fn(), refresh: jest.fn() }) }));
const demoActions = {
  saveDemoAction: jest.fn(),
  renameDemoAction: jest.fn(),
  duplicateDemoAction: jest.fn(),
  deleteDemoAction: jest.fn(),
  makeCallAction: jest.fn(),
};
jest.mock("@/app/(app)/curve-lab/actions", () => demoActions);
const airframeActions = {
  createAirframeAction: jest.fn(),
  updateAirframeAction: jest.fn(),
  duplicateAirframeAction: jest.fn(),
  retireAirframeAction: jest.fn(),
};
jest.mock("@/app/(app)/curve-lab/airframes/actions", () => airframeActions);

/* eslint-disable @typescript-eslint/no-require-imports -- loaded after the mocks above */
const { DemoWorkbench } =
  require("@/app/(app)/curve-lab/_components/demo-workbench") as typeof import("@/app/(app)/curve-lab/_components/demo-workbench");
const { AirframeForm } =
  require("@/app/(app)/curve-lab/airframes/_components/airframe-form") as typeof import("@/app/(app)/curve-lab/airframes/_components/airframe-form");
const { AirframeButtons } =
  require("@/app/(app)/curve-lab/airframes/_components/airframe-actions") as typeof import("@/app/(app)/curve-lab/airframes/_components/airframe-actions");
const { formValuesFor } = require("@/lib/curve-lab/schema") as typeof import("@/lib/curve-lab/schema");
/* eslint-enable @typescript-eslint/no-require-imports */

const DEMO_ID = "00000000-0000-4000-8000-000000000101";
const REVISION_ID = "00000000-0000-4000-8000-000000000102";
const AIRFRAME_ID = "00000000-0000-4000-8000-000000000103";
const KEY = /^[A-Za-z0-9_-]{8,100}$/; // the shape runAction accepts

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
    flaps2: null,
  },
};

const failure = { ok: false, status: 409, message: "try again" };
const keyOf = (mock: jest.Mock, call: number) => (mock.mock.calls[call]![0] as { idempotencyKey?: string }).idempotencyKey;

function renderWorkbench(mode: "builder" | "student", spec: DemoSpec, demoId: string | null) {
  return render(
    <DemoWorkbench
      mode={mode}
      demoId={demoId}
      demoRevisionId={demoId ? REVISION_ID : null}
      revisionNumber={demoId ? 1 : null}
      name="Test"
      initialSpec={spec}
      airframes={[wren]}
    />,
  );
}

describe("Curve Lab create forms send an idempotency key", () => {
  beforeEach(() => jest.clearAllMocks());

  it("Save: the same key on a retry after a failure, a new key after a success", async () => {
    const save = demoActions.saveDemoAction;
    save.mockResolvedValueOnce(failure).mockResolvedValue({
      ok: true,
      data: { demoId: DEMO_ID, revisionId: REVISION_ID, revisionNumber: 1, newRevision: false },
    });
    renderWorkbench("builder", defaultSpec(wren), DEMO_ID);
    fireEvent.click(screen.getByTestId("save-demo"));
    await waitFor(() => expect(screen.getByTestId("demo-status")).toHaveTextContent("try again"));
    fireEvent.click(screen.getByTestId("save-demo"));
    await waitFor(() => expect(screen.getByTestId("demo-status")).toHaveTextContent("Saved (revision 1)"));
    fireEvent.click(screen.getByTestId("save-demo"));
    await waitFor(() => expect(save).toHaveBeenCalledTimes(3));
    expect(keyOf(save, 0)).toMatch(KEY);
    expect(keyOf(save, 1)).toBe(keyOf(save, 0));
    expect(keyOf(save, 2)).toMatch(KEY);
    expect(keyOf(save, 2)).not.toBe(keyOf(save, 0));
  });

  it("Duplicate (a demo): the same key on a retry after a failure", async () => {
    const dup = demoActions.duplicateDemoAction;
    dup.mockResolvedValueOnce(failure).mockResolvedValue({ ok: true, data: { demoId: DEMO_ID } });
    renderWorkbench("builder", defaultSpec(wren), DEMO_ID);
    fireEvent.click(screen.getByRole("button", { name: "Duplicate" }));
    await waitFor(() => expect(screen.getByTestId("demo-status")).toHaveTextContent("try again"));
    fireEvent.click(screen.getByRole("button", { name: "Duplicate" }));
    await waitFor(() => expect(dup).toHaveBeenCalledTimes(2));
    expect(keyOf(dup, 0)).toMatch(KEY);
    expect(keyOf(dup, 1)).toBe(keyOf(dup, 0));
  });

  it("Call it first: the call carries a key, repeated on a retry after a failure", async () => {
    const call = demoActions.makeCallAction;
    call
      .mockResolvedValueOnce(failure)
      .mockResolvedValue({ ok: true, data: { id: "c1", predictedMs: 31, actualMs: 30, errorMs: 1, alreadyMade: false } });
    renderWorkbench("student", { ...defaultSpec(wren), callKind: "vmd" }, DEMO_ID);
    fireEvent.change(screen.getByLabelText(/^Speed/), { target: { value: "60" } });
    fireEvent.click(screen.getByTestId("make-call"));
    await waitFor(() => expect(call).toHaveBeenCalledTimes(1));
    await waitFor(() => expect(screen.getByTestId("make-call")).toBeEnabled());
    fireEvent.click(screen.getByTestId("make-call"));
    await waitFor(() => expect(call).toHaveBeenCalledTimes(2));
    expect(keyOf(call, 0)).toMatch(KEY);
    expect(keyOf(call, 1)).toBe(keyOf(call, 0));
    expect(call.mock.calls[0]![0]).toMatchObject({ demoRevisionId: REVISION_ID, kind: "vmd" });
  });

  it("Create profile: the aircraft profile form sends one key per form, repeated on a retry", async () => {
    const create = airframeActions.createAirframeAction;
    create.mockResolvedValueOnce(failure).mockResolvedValue({ ok: true, data: { id: AIRFRAME_ID } });
    render(<AirframeForm airframeId={null} defaults={formValuesFor({ ...wren, notes: "" }, "metric")} />);
    fireEvent.click(screen.getByRole("button", { name: "Create profile" }));
    await waitFor(() => expect(create).toHaveBeenCalledTimes(1));
    await waitFor(() => expect(screen.getByTestId("form-message")).toHaveTextContent("try again"));
    fireEvent.click(screen.getByRole("button", { name: "Create profile" }));
    await waitFor(() => expect(create).toHaveBeenCalledTimes(2));
    expect(keyOf(create, 0)).toMatch(KEY);
    expect(keyOf(create, 1)).toBe(keyOf(create, 0));
    expect(create.mock.calls[0]![0]).toMatchObject({ name: "Test trainer", units: "metric" });
  });

  it("Duplicate (a profile): the same key on a retry after a failure", async () => {
    const dup = airframeActions.duplicateAirframeAction;
    dup.mockResolvedValueOnce(failure).mockResolvedValue({ ok: true, data: { id: AIRFRAME_ID } });
    render(<AirframeButtons airframeId={AIRFRAME_ID} retired={false} />);
    fireEvent.click(screen.getByRole("button", { name: "Duplicate" }));
    await waitFor(() => expect(screen.getByText("try again")).toBeInTheDocument());
    fireEvent.click(screen.getByRole("button", { name: "Duplicate" }));
    await waitFor(() => expect(dup).toHaveBeenCalledTimes(2));
    expect(keyOf(dup, 0)).toMatch(KEY);
    expect(keyOf(dup, 1)).toBe(keyOf(dup, 0));
    expect(dup.mock.calls[0]![0]).toMatchObject({ airframeId: AIRFRAME_ID });
  });
});
