import { render, screen, within, fireEvent } from "@testing-library/react";
import { DataTable } from "@/components/ui/data-table";

// The data table used by End of training and Accounts (components/ui/data-table.tsx): headers from
// the column list, the `more` columns marked for the phone's "More columns" button, which counts them.

it("draws the headers in order, marks the more columns and counts them on the button", () => {
  render(
    <DataTable
      label="Staff and sponsors, scrolls sideways"
      testId="accounts-table"
      columns={[{ header: "Name" }, { header: "Roles" }, { header: "E-mail", more: true }]}
    >
      <tr>
        <td>Imogen Farrant</td>
        <td>Chief instructor</td>
        <td data-more="">imogen@chalkwing.test</td>
      </tr>
    </DataTable>,
  );
  const table = screen.getByTestId("accounts-table");
  const headers = within(table).getAllByRole("columnheader");
  expect(headers.map((h) => h.textContent)).toEqual(["Name", "Roles", "E-mail"]);
  expect(headers.map((h) => h.hasAttribute("data-more"))).toEqual([false, false, true]);
  expect(headers.every((h) => h.getAttribute("scope") === "col")).toBe(true);
  expect(within(table).getByRole("cell", { name: "Imogen Farrant" })).toBeInTheDocument();
  expect(screen.getByRole("region", { name: "Staff and sponsors, scrolls sideways" })).toContainElement(table);
  const more = screen.getByRole("button", { name: "More columns (1)" });
  expect(more).toHaveAttribute("aria-expanded", "false");
  fireEvent.click(more);
  expect(screen.getByRole("button", { name: "Fewer columns" })).toHaveAttribute("aria-expanded", "true");
});

it("shows no More columns button when every column fits", () => {
  render(
    <DataTable label="Two columns" columns={[{ header: "Student" }, { header: "Cohort" }]}>
      <tr>
        <td>Ines Varga</td>
        <td>no cohort</td>
      </tr>
    </DataTable>,
  );
  expect(screen.queryByRole("button")).toBeNull();
  expect(screen.getAllByRole("columnheader").map((h) => h.textContent)).toEqual(["Student", "Cohort"]);
});
