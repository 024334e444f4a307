import { render, screen } from "@testing-library/react";
import { NameFilterForm, StudentFilterForm } from "@/components/student-pages";
import { COHORT_CHOICES_MAX } from "@/lib/records/schema";

// The filter form of the paged student lists (Records, Progress map, Ground log, End of training):
// the cohort is a choice of names while the school has up to COHORT_CHOICES_MAX cohorts, and a
// "Cohort name contains" field beyond, so the page does not grow with the number of cohorts.

const cohorts = (n: number) => Array.from({ length: n }, (_, i) => ({ id: `c${i}`, name: `Cohort ${i + 1}` }));

it("offers the cohorts as a list up to the bound", () => {
  render(<StudentFilterForm basePath="/records" q={{}} cohorts={cohorts(COHORT_CHOICES_MAX)} />);
  const choice = screen.getByRole("combobox", { name: "Cohort" });
  expect(choice.querySelectorAll("option")).toHaveLength(COHORT_CHOICES_MAX + 1); // "Any" and each cohort
  expect(screen.queryByRole("searchbox", { name: "Cohort name contains" })).toBeNull();
});

it("asks for a part of the cohort's name beyond the bound, keeping what was asked", () => {
  render(<StudentFilterForm basePath="/records" q={{ cohortName: "C0007" }} cohorts={cohorts(COHORT_CHOICES_MAX + 1)} />);
  const field = screen.getByRole("searchbox", { name: "Cohort name contains" });
  expect(field).toHaveAttribute("name", "cohortName");
  expect(field).toHaveValue("C0007");
  expect(screen.queryByRole("combobox", { name: "Cohort" })).toBeNull();
  // a filter is set, so the form offers to clear it
  expect(screen.getByRole("link", { name: "Clear" })).toHaveAttribute("href", "/records");
});

it("narrows a list by a part of the name only (Cohorts, Accounts and roles), keeping what was asked", () => {
  const { unmount } = render(<NameFilterForm basePath="/cohorts" name={undefined} idPrefix="cohorts" label="Find a cohort" />);
  const form = screen.getByRole("form", { name: "Find a cohort" });
  // the form says on screen what it narrows
  expect(screen.getByRole("heading", { name: "Find a cohort" })).toBeInTheDocument();
  expect(form).toHaveAttribute("method", "get");
  expect(form).toHaveAttribute("action", "/cohorts");
  expect(screen.getByRole("searchbox", { name: "Name contains" })).toHaveAttribute("name", "name");
  expect(screen.queryByRole("link", { name: "Clear" })).toBeNull();
  unmount();
  render(<NameFilterForm basePath="/people/accounts" name="Ortega" idPrefix="accounts" label="Find an account" />);
  expect(screen.getByRole("searchbox", { name: "Name contains" })).toHaveValue("Ortega");
  expect(screen.getByRole("link", { name: "Clear" })).toHaveAttribute("href", "/people/accounts");
});
