import { render, screen, fireEvent, waitFor } from "@testing-library/react";

// Issue 12 leftover: withdrawing an oral check or a sign-off is signed like a sign-off. The form
// asks for the password, sends it, and shows the server's refusal naming the password field.

jest.mock("next/navigation", () => ({ useRouter: () => ({ push: jest.fn(), replace: jest.fn(), refresh: jest.fn() }) }));
const actions = { withdrawCheckAction: jest.fn(), withdrawSignOffAction: jest.fn() };
jest.mock("@/app/(app)/records/actions", () => actions);
/* eslint-disable @typescript-eslint/no-require-imports */
const { WithdrawButton } =
  require("@/app/(app)/records/[studentId]/_components/withdraw-button") as typeof import("@/app/(app)/records/[studentId]/_components/withdraw-button");
/* eslint-enable @typescript-eslint/no-require-imports */

const ID = "00000000-0000-4000-8000-0000000000c1";
beforeEach(() => jest.clearAllMocks());

describe.each([
  ["check", "withdrawCheckAction", { checkId: ID }],
  ["signOff", "withdrawSignOffAction", { signOffId: ID }],
] as const)("withdrawing a %s", (kind, action, ids) => {
  it("asks for the password, sends it with the reason, and shows a wrong password's refusal", async () => {
    actions[action].mockResolvedValue({ ok: false, status: 422, field: "password", message: "Password: does not match your password" });
    render(<WithdrawButton kind={kind} id={ID} label="Withdraw it" />);
    fireEvent.click(screen.getByRole("button", { name: "Withdraw it" }));
    const sign = screen.getByRole("button", { name: "Sign the withdrawal" });
    fireEvent.change(screen.getByLabelText("Reason for the withdrawal"), { target: { value: "Wrong student" } });
    expect(sign).toBeDisabled(); // nothing is sent before the password is re-entered
    const password = screen.getByLabelText("Re-enter your password to sign the withdrawal");
    expect(password).toHaveAttribute("type", "password");
    fireEvent.change(password, { target: { value: "typed-password" } });
    fireEvent.click(sign);
    await waitFor(() => expect(actions[action]).toHaveBeenCalledWith({ ...ids, reason: "Wrong student", password: "typed-password" }));
    expect(await screen.findByRole("alert")).toHaveTextContent("Password: does not match your password");
    expect(password).toHaveAttribute("aria-invalid", "true");
  });
});
