import { render, screen, waitFor } from "@testing-library/react";
import userEvent from "@testing-library/user-event";
import { QueryClient, QueryClientProvider } from "@tanstack/react-query";
import { ChoiceField, SearchPicker } from "@/components/search-picker";
import { PICKER_LIST_MAX, type PickerAnswer } from "@/lib/directory/picker";

// The search picker over growing sets: typing asks the endpoint (debounced) and lists what it
// answers, the keyboard moves and chooses, the choice goes into a hidden input under the field's
// name; ChoiceField keeps the plain <select> while the set is small.

const ROWS = [
  { id: "11111111-1111-4111-8111-111111111111", name: "Mara Holt", primary: "Mara Holt" },
  { id: "22222222-2222-4222-8222-222222222222", name: "Marek Vane", primary: "Marek Vane", detail: "PPL-GS" },
];

let fetchMock: jest.Mock;

beforeEach(() => {
  fetchMock = jest.fn(async (url: string) => {
    const q = new URL(url, "http://localhost").searchParams.get("q") ?? "";
    const body: PickerAnswer = { rows: ROWS.filter((r) => r.name.toLowerCase().includes(q.toLowerCase())), more: false };
    return { ok: true, status: 200, json: async () => body };
  });
  (globalThis as { fetch: unknown }).fetch = fetchMock;
});

function wrap(ui: React.ReactElement) {
  const client = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  return render(<QueryClientProvider client={client}>{ui}</QueryClientProvider>);
}

function form(onChange?: jest.Mock) {
  return wrap(
    <form aria-label="test form">
      <SearchPicker
        id="pick-student"
        name="studentId"
        label="Student"
        endpoint="/api/directory/students"
        params={{ purpose: "cohorts" }}
        onChange={onChange}
      />
    </form>,
  );
}

const hidden = () =>
  (screen.getByRole("form", { name: "test form" }) as HTMLFormElement).elements.namedItem("studentId") as HTMLInputElement;

it("fetches as one types and lists the answers, with the count announced", async () => {
  const user = userEvent.setup();
  form();
  const box = screen.getByRole("combobox", { name: "Student" });
  expect(box.tagName).toBe("INPUT");
  await user.type(box, "mare");
  await waitFor(() => expect(screen.getByRole("status")).toHaveTextContent("1 result"));
  expect(screen.getAllByRole("option").map((o) => o.textContent)).toEqual(["Marek VanePPL-GS"]);
  expect(box).toHaveAttribute("aria-expanded", "true");
  const last = fetchMock.mock.calls.at(-1)![0] as string;
  const asked = new URL(last, "http://localhost");
  expect(asked.pathname).toBe("/api/directory/students");
  expect(asked.searchParams.get("purpose")).toBe("cohorts");
  expect(asked.searchParams.get("q")).toBe("mare");
  // debounced: not one request per key
  expect(fetchMock.mock.calls.length).toBeLessThan(4);
});

it("chooses with the keyboard: Down, Down, Enter sets the hidden input and closes the list", async () => {
  const user = userEvent.setup();
  const onChange = jest.fn();
  form(onChange);
  const box = screen.getByRole("combobox", { name: "Student" });
  await user.type(box, "mar");
  await waitFor(() => expect(screen.getAllByRole("option")).toHaveLength(2));
  await waitFor(() => expect(screen.getByRole("status")).toHaveTextContent("2 results"));
  expect(hidden().value).toBe("");
  await user.keyboard("{ArrowDown}{ArrowDown}");
  expect(box).toHaveAttribute("aria-activedescendant", screen.getByRole("option", { name: /Marek Vane/ }).id);
  expect(screen.getByRole("option", { name: /Marek Vane/ })).toHaveAttribute("aria-selected", "true");
  await user.keyboard("{Enter}");
  expect(hidden().value).toBe(ROWS[1]!.id);
  expect(box).toHaveValue("Marek Vane");
  expect(box).toHaveAttribute("aria-expanded", "false");
  expect(onChange).toHaveBeenLastCalledWith(ROWS[1]);
  // typing again drops the choice until another is made
  await user.type(box, "x");
  expect(hidden().value).toBe("");
  expect(onChange).toHaveBeenLastCalledWith(null);
});

it("Escape closes the list without choosing", async () => {
  const user = userEvent.setup();
  form();
  const box = screen.getByRole("combobox", { name: "Student" });
  await user.type(box, "mar");
  await waitFor(() => expect(screen.getAllByRole("option")).toHaveLength(2));
  await user.keyboard("{ArrowDown}{Escape}");
  expect(box).toHaveAttribute("aria-expanded", "false");
  expect(hidden().value).toBe("");
});

it("says when more match than were answered, and names the field in its error", async () => {
  fetchMock.mockImplementation(async () => ({ ok: true, status: 200, json: async () => ({ rows: ROWS, more: true }) }));
  const user = userEvent.setup();
  wrap(<SearchPicker id="pick-c" name="cohortId" label="Cohort" endpoint="/api/directory/cohorts" error="choose a cohort" />);
  const box = screen.getByRole("combobox", { name: "Cohort" });
  expect(box).toHaveAttribute("aria-invalid", "true");
  expect(box).toHaveAccessibleDescription(/Cohort: choose a cohort/);
  await user.click(box);
  await waitFor(() => expect(screen.getByRole("status")).toHaveTextContent("2 shown, more match"));
});

it("keeps the plain select (and asks nothing) while the set is small", () => {
  const rows = Array.from({ length: PICKER_LIST_MAX }, (_, i) => ({ id: `s${i}`, name: `Student ${i + 1}` }));
  wrap(
    <ChoiceField
      id="pl-student"
      name="studentId"
      label="Student"
      emptyLabel="Choose a student"
      choices={{ kind: "list", rows }}
      defaultValue="s3"
      endpoint="/api/directory/students"
      params={{ purpose: "cohorts" }}
    />,
  );
  const select = screen.getByRole("combobox", { name: "Student" });
  expect(select.tagName).toBe("SELECT");
  expect(select).toHaveAttribute("name", "studentId");
  expect(select.querySelectorAll("option")).toHaveLength(PICKER_LIST_MAX + 1);
  expect(select).toHaveValue("s3");
  expect(fetchMock).not.toHaveBeenCalled();
});

it("renders the search picker when the server says to search", () => {
  wrap(
    <ChoiceField
      id="pl-student"
      name="studentId"
      label="Student"
      emptyLabel="Choose a student"
      choices={{ kind: "search" }}
      initial={{ id: ROWS[0]!.id, name: ROWS[0]!.name }}
      endpoint="/api/directory/students"
      params={{ purpose: "cohorts" }}
    />,
  );
  const box = screen.getByRole("combobox", { name: "Student" });
  expect(box.tagName).toBe("INPUT");
  expect(box).toHaveValue("Mara Holt");
  expect(document.querySelector('input[type="hidden"][name="studentId"]')).toHaveValue(ROWS[0]!.id);
});
