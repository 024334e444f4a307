import { render, screen, fireEvent, waitFor, within } from "@testing-library/react";

// Issue 12 leftover: when the server refuses a stage check naming an item left without an oral
// outcome (oralOutcomes.<item id>.outcome), the form shows the message on that item's row.

jest.mock("next/navigation", () => ({ useRouter: () => ({ push: jest.fn(), replace: jest.fn(), refresh: jest.fn() }) }));
const actions = { conductStageCheckAction: jest.fn() };
jest.mock("@/app/(app)/records/actions", () => actions);
/* eslint-disable @typescript-eslint/no-require-imports */
const { StageCheckForm } =
  require("@/app/(app)/records/[studentId]/_components/stage-check-form") as typeof import("@/app/(app)/records/[studentId]/_components/stage-check-form");
/* eslint-enable @typescript-eslint/no-require-imports */

const ITEMS = [
  { id: "00000000-0000-4000-8000-0000000000a1", code: "AER-01", title: "Zero-lift drag" },
  { id: "00000000-0000-4000-8000-0000000000a2", code: "AER-02", title: "Lift-dependent drag" },
];

it("puts the server's per-item refusal on the item's row", async () => {
  // e.g. the stage gained an item after the page was opened: the server names it
  actions.conductStageCheckAction.mockResolvedValue({
    ok: false,
    status: 400,
    message: "Outcome: choose the oral outcome of AER-02: Solid, Shaky or Not yet",
    field: `oralOutcomes.${ITEMS[1]!.id}.outcome`,
    fieldErrors: { [`oralOutcomes.${ITEMS[1]!.id}.outcome`]: ["choose the oral outcome of AER-02: Solid, Shaky or Not yet"] },
  });
  render(
    <StageCheckForm
      studentId="00000000-0000-4000-8000-0000000000f1"
      stageId="00000000-0000-4000-8000-0000000000b1"
      stageCode="AER"
      items={ITEMS}
      isLead={false}
      mayOverride={false}
      passMark={75}
      statement="I, Examiner, certify that I examined the student."
    />,
  );
  for (const code of ["AER-01", "AER-02"])
    fireEvent.change(screen.getByLabelText(`Oral outcome for ${code}`), { target: { value: "solid" } });
  fireEvent.change(screen.getByLabelText("Result"), { target: { value: "pass" } });
  fireEvent.change(screen.getByLabelText("Re-enter your password to sign"), { target: { value: "typed-password" } });
  fireEvent.click(screen.getByRole("button", { name: "Sign the stage check" }));
  await waitFor(() => expect(actions.conductStageCheckAction).toHaveBeenCalled());
  const row = screen.getByLabelText("Oral outcome for AER-02").closest("td")!;
  expect(await within(row).findByRole("alert")).toHaveTextContent("choose the oral outcome of AER-02: Solid, Shaky or Not yet");
  expect(screen.getByLabelText("Oral outcome for AER-02")).toHaveAttribute("aria-invalid", "true");
  expect(screen.getByLabelText("Oral outcome for AER-01")).not.toHaveAttribute("aria-invalid");
});
