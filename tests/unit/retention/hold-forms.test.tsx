import { render, screen, fireEvent, waitFor } from "@testing-library/react";

// The legal hold forms on Retention (set and lift, one form with a reason): each sends its own
// action with the reason typed, says what happened, and puts a refusal of the reason beside the field.

jest.mock("next/navigation", () => ({ useRouter: () => ({ push: jest.fn(), replace: jest.fn(), refresh: jest.fn() }) }));
const actions = {
  setLegalHoldAction: jest.fn(),
  liftLegalHoldAction: jest.fn(),
  archiveRecordAction: jest.fn(),
  saveRetentionSettingsAction: jest.fn(),
};
jest.mock("@/app/(app)/retention/actions", () => actions);
/* eslint-disable @typescript-eslint/no-require-imports */
const { SetHoldForm, LiftHoldForm } =
  require("@/app/(app)/retention/_components/retention-forms") as typeof import("@/app/(app)/retention/_components/retention-forms");
/* eslint-enable @typescript-eslint/no-require-imports */

const STUDENT = "00000000-0000-4000-8000-0000000000f1";
const HOLD = "00000000-0000-4000-8000-0000000000c1";

beforeEach(() => jest.clearAllMocks());

it("sets a hold on the student's record with the reason and one idempotency key per form", async () => {
  actions.setLegalHoldAction.mockResolvedValue({ ok: true });
  render(<SetHoldForm studentId={STUDENT} name="Casimir Wetherell" />);
  const form = screen.getByRole("form", { name: "Legal hold on the record of Casimir Wetherell" });
  fireEvent.change(screen.getByLabelText("Reason for a legal hold"), { target: { value: "Inspection by the authority" } });
  fireEvent.click(screen.getByRole("button", { name: "Set a legal hold" }));
  expect(await screen.findByText("Legal hold set.")).toBeInTheDocument();
  fireEvent.click(screen.getByRole("button", { name: "Set a legal hold" }));
  await waitFor(() => expect(actions.setLegalHoldAction).toHaveBeenCalledTimes(2));
  const [first, second] = actions.setLegalHoldAction.mock.calls.map((c) => c[0]);
  expect(first).toEqual({ studentId: STUDENT, reason: "Inspection by the authority", idempotencyKey: expect.any(String) });
  expect(second.idempotencyKey).toBe(first.idempotencyKey);
  expect(form).toBeInTheDocument();
  expect(actions.liftLegalHoldAction).not.toHaveBeenCalled();
});

it("lifts a hold with the reason, and shows a refusal of the reason beside the field", async () => {
  actions.liftLegalHoldAction.mockResolvedValue({
    ok: false,
    message: "Reason: give a reason of at least 3 characters",
    fieldErrors: { reason: ["give a reason of at least 3 characters"] },
  });
  render(<LiftHoldForm holdId={HOLD} name="Casimir Wetherell" />);
  expect(screen.getByRole("form", { name: "Lift the legal hold on the record of Casimir Wetherell" })).toBeInTheDocument();
  const field = screen.getByLabelText("Reason for lifting the hold");
  fireEvent.change(field, { target: { value: "x" } });
  fireEvent.click(screen.getByRole("button", { name: "Lift the hold" }));
  expect(await screen.findByText("give a reason of at least 3 characters")).toBeInTheDocument();
  expect(actions.liftLegalHoldAction).toHaveBeenCalledWith({ holdId: HOLD, reason: "x" });
  expect(field).toHaveAttribute("aria-invalid", "true");
  expect(field.getAttribute("aria-describedby")).toBe(screen.getByText("give a reason of at least 3 characters").id);
  expect(screen.getByText("Reason: give a reason of at least 3 characters")).toBeInTheDocument();
  expect(actions.setLegalHoldAction).not.toHaveBeenCalled();
});
