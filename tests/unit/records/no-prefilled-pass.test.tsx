import { render, screen, fireEvent, within, waitFor } from "@testing-library/react";
import { REFERENCE_AIRCRAFT } from "@/lib/records/questions";
import { recordCheckSchema, stageCheckSchema } from "@/lib/records/schema";

// Issue 12, "Nothing starts as a pass": the oral-check and stage-check forms open with every
// outcome, level and result unselected, and submitting without choosing names each missing field.

jest.mock("next/navigation", () => ({ useRouter: () => ({ push: jest.fn(), replace: jest.fn(), refresh: jest.fn() }) }));
const actions = {
  recordCheckAction: jest.fn(),
  amendCheckAction: jest.fn(),
  conductStageCheckAction: jest.fn(),
};
jest.mock("@/app/(app)/records/actions", () => actions);
/* eslint-disable @typescript-eslint/no-require-imports */
const { CheckForm } =
  require("@/app/(app)/records/[studentId]/_components/check-form") as typeof import("@/app/(app)/records/[studentId]/_components/check-form");
const { StageCheckForm } =
  require("@/app/(app)/records/[studentId]/_components/stage-check-form") as typeof import("@/app/(app)/records/[studentId]/_components/stage-check-form");
/* eslint-enable @typescript-eslint/no-require-imports */

const ITEMS = [
  { id: "00000000-0000-4000-8000-0000000000a1", code: "AER-01", title: "Zero-lift drag", requiredLevel: "understanding" as const },
  { id: "00000000-0000-4000-8000-0000000000a2", code: "AER-02", title: "Lift-dependent drag", requiredLevel: "understanding" as const },
];
const STUDENT = "00000000-0000-4000-8000-0000000000f1";

beforeEach(() => jest.clearAllMocks());

describe("the oral-check form", () => {
  const renderForm = () => render(<CheckForm studentId={STUDENT} items={ITEMS} aircraft={REFERENCE_AIRCRAFT} sessions={[]} />);

  it("opens with no item, level, outcome or element kind chosen, and its preview does not say the standard is met", () => {
    renderForm();
    const form = screen.getByRole("form", { name: "Oral check" });
    for (const box of within(form).getAllByRole("checkbox", { name: /AER-0/ })) expect(box).not.toBeChecked();
    for (const name of [
      "Rote",
      "Understanding",
      "Application",
      "Correlation",
      "Solid",
      "Shaky",
      "Not yet",
      "Required element",
      "Not a required element",
    ])
      expect(within(form).getByRole("radio", { name })).not.toBeChecked();
    expect(within(form).getByLabelText("Syllabus item")).toHaveValue("");
    const verdict = screen.getByTestId("outcome-verdict");
    expect(verdict).not.toHaveTextContent(/meets the standard/i);
    expect(verdict).toHaveTextContent("not decided yet");
  });

  it("submitting without choosing names each missing field and sends nothing", async () => {
    renderForm();
    fireEvent.change(screen.getByLabelText("Question as asked"), { target: { value: "Name the parts of zero-lift drag." } });
    fireEvent.click(screen.getByRole("button", { name: "Record the check" }));
    await waitFor(() => expect(screen.getByText("choose at least one syllabus item")).toBeInTheDocument());
    expect(screen.getByText("choose the level of learning shown")).toBeInTheDocument();
    expect(screen.getByText("choose the syllabus item of the question")).toBeInTheDocument();
    expect(screen.getByText("choose the outcome: Solid, Shaky or Not yet")).toBeInTheDocument();
    expect(screen.getByText("choose whether the question is on a required element")).toBeInTheDocument();
    expect(actions.recordCheckAction).not.toHaveBeenCalled();
  });

  it("says the standard is met only once everything is chosen", () => {
    renderForm();
    fireEvent.click(screen.getByRole("checkbox", { name: /AER-01/ }));
    fireEvent.click(screen.getByRole("radio", { name: "Understanding" }));
    fireEvent.change(screen.getByLabelText("Syllabus item"), { target: { value: ITEMS[0]!.id } });
    fireEvent.click(screen.getByRole("radio", { name: "Solid" }));
    expect(screen.getByTestId("outcome-verdict")).not.toHaveTextContent(/meets the standard/i);
    fireEvent.click(screen.getByRole("radio", { name: "Required element" }));
    expect(screen.getByTestId("outcome-verdict")).toHaveTextContent("Outcome by the rule: Meets the standard");
  });
});

describe("the stage-check form", () => {
  const renderForm = () =>
    render(
      <StageCheckForm
        studentId={STUDENT}
        stageId="00000000-0000-4000-8000-0000000000b1"
        stageCode="AER"
        items={ITEMS}
        isLead={false}
        mayOverride={false}
        passMark={75}
        statement="I, Examiner, certify that I examined the student."
      />,
    );

  it("opens with no oral outcome and no result chosen, shows the statement and asks for the password", () => {
    renderForm();
    expect(screen.getByLabelText("Oral outcome for AER-01")).toHaveValue("");
    expect(screen.getByLabelText("Oral outcome for AER-02")).toHaveValue("");
    expect(screen.getByLabelText("Result")).toHaveValue("");
    expect(screen.getByTestId("stage-statement")).toHaveTextContent("I, Examiner, certify");
    expect(screen.getByLabelText("Re-enter your password to sign")).toHaveAttribute("type", "password");
  });

  it("submitting without choosing names each missing field and sends nothing", () => {
    renderForm();
    fireEvent.click(screen.getByRole("button", { name: "Sign the stage check" }));
    const alerts = screen.getAllByRole("alert").map((a) => a.textContent);
    expect(alerts).toEqual(
      expect.arrayContaining([
        "choose the oral outcome of AER-01",
        "choose the oral outcome of AER-02",
        "choose the result: pass or fail",
        "re-enter your password",
      ]),
    );
    expect(actions.conductStageCheckAction).not.toHaveBeenCalled();
  });
});

describe("the schemas refuse a missing choice, naming it", () => {
  it("oral check: level, outcome and element kind", () => {
    const r = recordCheckSchema.safeParse({
      studentId: STUDENT,
      itemIds: [ITEMS[0]!.id],
      durationMinutes: 5,
      occurredAt: "2026-11-01T10:00:00Z",
      questions: [{ syllabusItemId: ITEMS[0]!.id, questionText: "Why?" }],
    });
    expect(r.success).toBe(false);
    const byPath = Object.fromEntries((r.error?.issues ?? []).map((i) => [i.path.join("."), i.message]));
    expect(byPath).toMatchObject({
      levelShown: "choose the level of learning shown",
      "questions.0.outcome": "choose the outcome: Solid, Shaky or Not yet",
      "questions.0.required": "choose whether the question is on a required element",
    });
  });

  it("stage check: result, each oral outcome and the password", () => {
    const r = stageCheckSchema.safeParse({
      studentId: STUDENT,
      stageId: STUDENT,
      oralOutcomes: [{ itemId: ITEMS[0]!.id }],
      occurredAt: "2026-11-01T10:00:00Z",
    });
    const byPath = Object.fromEntries((r.error?.issues ?? []).map((i) => [i.path.join("."), i.message]));
    expect(byPath).toMatchObject({
      result: "choose the result: pass or fail",
      "oralOutcomes.0.outcome": "choose the oral outcome of the item: Solid, Shaky or Not yet",
      password: "re-enter your password",
    });
  });
});
