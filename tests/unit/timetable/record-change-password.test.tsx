import { render, screen, fireEvent, waitFor } from "@testing-library/react";

// Amending recorded attendance and waiving a make-up item are signed like a sign-off: each form
// asks for the password (labelled, type password, autocomplete current-password), sends it, and
// shows a wrong password's refusal beside the field, which it empties for another try.

jest.mock("next/navigation", () => ({ useRouter: () => ({ push: jest.fn(), replace: jest.fn(), refresh: jest.fn() }) }));
const timetable = { recordAttendanceAction: jest.fn(), amendEntryAction: jest.fn() };
const groundLog = { scheduleMakeupAction: jest.fn(), closeMakeupAction: jest.fn(), waiveMakeupAction: jest.fn() };
jest.mock("@/app/(app)/timetable/actions", () => timetable);
jest.mock("@/app/(app)/ground-log/actions", () => groundLog);
/* eslint-disable @typescript-eslint/no-require-imports */
const { AttendanceSheet } =
  require("@/app/(app)/timetable/_components/attendance-sheet") as typeof import("@/app/(app)/timetable/_components/attendance-sheet");
const { MakeupActions } =
  require("@/app/(app)/ground-log/_components/makeup-actions") as typeof import("@/app/(app)/ground-log/_components/makeup-actions");
/* eslint-enable @typescript-eslint/no-require-imports */

const SESSION = "00000000-0000-4000-8000-0000000000a1";
const STUDENT = "00000000-0000-4000-8000-0000000000b1";
const ENTRY = "00000000-0000-4000-8000-0000000000c1";
const ITEM = "00000000-0000-4000-8000-0000000000d1";
const refusal = {
  ok: false,
  status: 422,
  field: "password",
  message: "Password: does not match your password",
  fieldErrors: { password: ["does not match your password"] },
};
beforeEach(() => jest.clearAllMocks());

it("the Correct form asks for the password, sends it, and shows a wrong one beside the field", async () => {
  timetable.amendEntryAction.mockResolvedValue(refusal);
  const line = {
    studentId: STUDENT,
    name: "Ada Reyes",
    entryId: ENTRY,
    status: "absent" as const,
    lateMinutes: 0,
    earlyMinutes: 0,
    creditedMinutes: 0,
    amendmentCount: 0,
    history: [],
  };
  render(<AttendanceSheet sessionId={SESSION} sessionMinutes={60} lines={[line]} />);
  fireEvent.click(screen.getByRole("button", { name: "Correct Ada Reyes's entry" }));
  fireEvent.change(screen.getByLabelText("What was wrong"), { target: { value: "Was in the room" } });
  // no password: refused in the form, nothing sent
  fireEvent.click(screen.getByRole("button", { name: "Save the amendment" }));
  expect(await screen.findByText("re-enter your password")).toBeInTheDocument();
  expect(timetable.amendEntryAction).not.toHaveBeenCalled();
  const password = screen.getByLabelText("Re-enter your password to sign the amendment");
  expect(password).toHaveAttribute("type", "password");
  expect(password).toHaveAttribute("autocomplete", "current-password");
  fireEvent.change(password, { target: { value: "typed-password" } });
  fireEvent.click(screen.getByRole("button", { name: "Save the amendment" }));
  await waitFor(() =>
    expect(timetable.amendEntryAction).toHaveBeenCalledWith(
      expect.objectContaining({ entryId: ENTRY, reason: "Was in the room", password: "typed-password" }),
    ),
  );
  expect(await screen.findByText("does not match your password")).toBeInTheDocument();
  expect(screen.getByLabelText("Re-enter your password to sign the amendment")).toHaveAttribute("aria-invalid", "true");
  expect(screen.getByLabelText("Re-enter your password to sign the amendment")).toHaveValue("");
});

it("the Waive form asks for the password, sends it, and shows a wrong one beside the field", async () => {
  groundLog.waiveMakeupAction.mockResolvedValue(refusal);
  render(<MakeupActions itemId={ITEM} state="open" canWaive sessions={[]} />);
  fireEvent.click(screen.getByRole("button", { name: "Waive" }));
  fireEvent.change(screen.getByLabelText("Reason for the waiver"), { target: { value: "Covered in the workshop" } });
  fireEvent.click(screen.getByRole("button", { name: "Save" }));
  expect(await screen.findByText("re-enter your password")).toBeInTheDocument();
  expect(groundLog.waiveMakeupAction).not.toHaveBeenCalled();
  const password = screen.getByLabelText("Re-enter your password to sign the waiver");
  expect(password).toHaveAttribute("type", "password");
  expect(password).toHaveAttribute("autocomplete", "current-password");
  fireEvent.change(password, { target: { value: "typed-password" } });
  fireEvent.click(screen.getByRole("button", { name: "Save" }));
  await waitFor(() =>
    expect(groundLog.waiveMakeupAction).toHaveBeenCalledWith({
      itemId: ITEM,
      reason: "Covered in the workshop",
      password: "typed-password",
    }),
  );
  expect(await screen.findByText("does not match your password")).toBeInTheDocument();
  expect(screen.getByLabelText("Re-enter your password to sign the waiver")).toHaveAttribute("aria-invalid", "true");
  expect(screen.getByLabelText("Re-enter your password to sign the waiver")).toHaveValue("");
});
