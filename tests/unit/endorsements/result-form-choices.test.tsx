import { render, screen, fireEvent, waitFor } from "@testing-library/react";
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import type { PickerAnswer, PickerChoices } from "@/lib/directory/picker";

// The knowledge-test result forms choose an endorsement awaiting its result and an open remedial
// item. While few, each is a plain <select>; once more than a list holds (the server says "search"),
// each is a search field asking GET /api/directory/endorsements with its kind, and the chosen id is
// what the form sends.

jest.mock("next/navigation", () => ({ useRouter: () => ({ push: jest.fn(), replace: jest.fn(), refresh: jest.fn() }) }));
const actions = { endorseAction: jest.fn(), recordResultAction: jest.fn(), completeRemedialAction: jest.fn() };
jest.mock("@/app/(app)/endorsements/actions", () => actions);
/* eslint-disable @typescript-eslint/no-require-imports */
const { EndorsementForms } =
  require("@/app/(app)/endorsements/_components/endorsement-forms") as typeof import("@/app/(app)/endorsements/_components/endorsement-forms");
/* eslint-enable @typescript-eslint/no-require-imports */

const ENDORSEMENT = "00000000-0000-4000-8000-0000000000e1";
const REMEDIAL = "00000000-0000-4000-8000-0000000000f1";
const none: PickerChoices = { kind: "list", rows: [] };
let asked: string[] = [];

beforeEach(() => {
  jest.clearAllMocks();
  asked = [];
  (globalThis as { fetch: unknown }).fetch = jest.fn(async (url: string) => {
    asked.push(url);
    const kind = new URL(url, "http://localhost").searchParams.get("kind");
    const body: PickerAnswer =
      kind === "awaiting"
        ? { rows: [{ id: ENDORSEMENT, name: "Wren Okafor", detail: "Tue 1 Dec 2026", primary: "Wren Okafor" }], more: false }
        : {
            rows: [
              {
                id: REMEDIAL,
                name: "Wren Okafor: Density altitude",
                detail: "test of Wed 2 Dec 2026",
                primary: "Wren Okafor: Density altitude",
              },
            ],
            more: false,
          };
    return { ok: true, status: 200, json: async () => body };
  });
});

function show(awaiting: PickerChoices, remedials: PickerChoices) {
  const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  return render(
    <QueryClientProvider client={client}>
      <EndorsementForms students={none} awaiting={awaiting} remedials={remedials} maySign={false} mayRecord />
    </QueryClientProvider>,
  );
}

it("few choices: plain lists naming the student and the date", () => {
  show(
    { kind: "list", rows: [{ id: ENDORSEMENT, name: "Wren Okafor", detail: "Tue 1 Dec 2026" }] },
    { kind: "list", rows: [{ id: REMEDIAL, name: "Wren Okafor: Density altitude", detail: "test of Wed 2 Dec 2026" }] },
  );
  const endorsement = screen.getByRole("combobox", { name: "Endorsement" }) as HTMLSelectElement;
  expect(endorsement.tagName).toBe("SELECT");
  expect(endorsement.value).toBe(ENDORSEMENT);
  expect(screen.getByRole("option", { name: "Wren Okafor (Tue 1 Dec 2026)" })).toBeTruthy();
  expect((screen.getByRole("combobox", { name: "Open remedial item" }) as HTMLSelectElement).tagName).toBe("SELECT");
});

it("nothing to choose: neither form is shown", () => {
  show(none, none);
  expect(screen.queryByRole("form", { name: "Record a test result" })).toBeNull();
  expect(screen.queryByRole("form", { name: "Remedial training done" })).toBeNull();
});

it("many: each form searches its own kind, and sends the chosen id", async () => {
  actions.completeRemedialAction.mockResolvedValue({ ok: true, data: {} });
  show({ kind: "search" }, { kind: "search" });
  expect(screen.getByRole("form", { name: "Record a test result" })).toBeTruthy();
  const box = screen.getByRole("combobox", { name: "Open remedial item" });
  expect(box.tagName).toBe("INPUT");
  fireEvent.focus(box);
  fireEvent.change(box, { target: { value: "density" } });
  await waitFor(() => expect(asked.some((u) => u.includes("kind=remedial") && u.includes("q=density"))).toBe(true));
  fireEvent.click(await screen.findByRole("option", { name: /Density altitude/ }));
  expect(asked.every((u) => u.startsWith("/api/directory/endorsements?"))).toBe(true);
  fireEvent.change(screen.getByLabelText("Training given"), { target: { value: "Reviewed with a worked example" } });
  fireEvent.click(screen.getByRole("button", { name: "Mark done" }));
  await waitFor(() =>
    expect(actions.completeRemedialAction).toHaveBeenCalledWith({ remedialId: REMEDIAL, note: "Reviewed with a worked example" }),
  );
});
