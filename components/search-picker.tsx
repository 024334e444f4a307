"use client";
import { useQuery } from "@tanstack/react-query";
import { useEffect, useId, useRef, useState } from "react";
import type { PickerAnswer, PickerChoices, PickerOption } from "@/lib/directory/picker";

// The search-as-you-type picker for sets that grow with the school (students, cohorts, accounts):
// an ARIA 1.2 combobox with a listbox. Typing asks `endpoint` (GET /api/directory/*, at most 20
// names) after a short pause; Up/Down move through the results, Enter chooses, Escape closes.
// The chosen id goes into a hidden input named `name`, so forms and server actions read it like a
// <select>'s value. `ChoiceField` renders a plain <select> instead when the set is small
// (PickerChoices from db/access/directory/*: the server decides).

const DEBOUNCE_MS = 250;

export interface SearchPickerProps {
  /** the text input's id (the label points at it) */
  id: string;
  /** the hidden input's name: what the form submits */
  name: string;
  label: string;
  /** GET endpoint answering `PickerAnswer`, e.g. "/api/directory/students" */
  endpoint: string;
  /** fixed query parameters, e.g. { purpose: "cohorts" } */
  params?: Record<string, string>;
  /** the choice shown at first (e.g. the filter in the URL) */
  initial?: PickerOption | null;
  /** an error about this field (shown under it, named by aria-describedby) */
  error?: string | null;
  placeholder?: string;
  /** told when the choice changes (null: cleared) */
  onChange?: (choice: PickerOption | null) => void;
  className?: string;
}

function useDebounced(value: string, ms: number): string {
  const [v, setV] = useState(value);
  useEffect(() => {
    const t = setTimeout(() => setV(value), ms);
    return () => clearTimeout(t);
  }, [value, ms]);
  return v;
}

async function fetchOptions(endpoint: string, params: Record<string, string>, q: string): Promise<PickerAnswer> {
  const qs = new URLSearchParams({ ...params, q });
  const res = await fetch(`${endpoint}?${qs.toString()}`, { headers: { accept: "application/json" } });
  const body = (await res.json().catch(() => null)) as (PickerAnswer & { error?: { message: string } }) | null;
  if (!res.ok || !body || !Array.isArray(body.rows)) throw new Error(body?.error?.message ?? `The search failed (${res.status})`);
  return body;
}

export function SearchPicker({
  id,
  name,
  label,
  endpoint,
  params = {},
  initial = null,
  error,
  placeholder,
  onChange,
  className,
}: SearchPickerProps) {
  const uid = useId();
  const listId = `${uid}-list`;
  const statusId = `${uid}-status`;
  const errorId = `${id}-error`;
  const [chosen, setChosen] = useState<PickerOption | null>(initial);
  const [text, setText] = useState(initial?.name ?? "");
  const [open, setOpen] = useState(false);
  const [active, setActive] = useState(-1);
  const inputRef = useRef<HTMLInputElement>(null);
  const typed = chosen && text === chosen.name ? "" : text.trim();
  const q = useDebounced(typed, DEBOUNCE_MS);
  const paramsKey = JSON.stringify(params);
  const result = useQuery({
    queryKey: ["picker", endpoint, paramsKey, q],
    queryFn: () => fetchOptions(endpoint, params, q),
    enabled: open,
    staleTime: 30_000,
  });
  const rows = result.data?.rows ?? [];
  const settled = !result.isFetching && q === typed;

  function choose(option: PickerOption | null) {
    setChosen(option);
    setText(option?.name ?? "");
    setOpen(false);
    setActive(-1);
    onChange?.(option);
  }

  function onKeyDown(e: React.KeyboardEvent<HTMLInputElement>) {
    if (e.key === "ArrowDown") {
      e.preventDefault();
      if (!open) setOpen(true);
      setActive((a) => (rows.length ? Math.min(a + 1, rows.length - 1) : -1));
    } else if (e.key === "ArrowUp") {
      e.preventDefault();
      setActive((a) => (rows.length ? Math.max(a - 1, 0) : -1));
    } else if (e.key === "Enter") {
      if (open && active >= 0 && rows[active]) {
        e.preventDefault();
        choose(rows[active]!);
      }
    } else if (e.key === "Escape") {
      if (open) {
        e.preventDefault();
        setOpen(false);
        setActive(-1);
        // the text goes back to what is chosen
        setText(chosen?.name ?? "");
      }
    }
  }

  let status = "";
  if (open) {
    if (result.isError) status = result.error instanceof Error ? result.error.message : "The search failed";
    else if (!settled) status = "Searching…";
    else if (rows.length === 0) status = typed ? `No match for "${typed}"` : "Nothing to choose";
    else if (result.data?.more) status = `${rows.length} shown, more match: type more of the name to narrow`;
    else status = `${rows.length} result${rows.length === 1 ? "" : "s"}`;
  }
  const describedBy = [statusId, error ? errorId : null].filter(Boolean).join(" ");

  return (
    <div className={`relative ${className ?? ""}`}>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <input type="hidden" name={name} value={chosen?.id ?? ""} data-testid={`${id}-value`} />
      <div className="flex gap-2">
        <input
          ref={inputRef}
          id={id}
          type="text"
          role="combobox"
          aria-expanded={open}
          aria-controls={listId}
          aria-autocomplete="list"
          aria-activedescendant={open && active >= 0 && rows[active] ? `${listId}-${rows[active]!.id}` : undefined}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy}
          autoComplete="off"
          spellCheck={false}
          className="field-input"
          placeholder={placeholder ?? "Type a name to search"}
          value={text}
          onChange={(e) => {
            setText(e.target.value);
            setOpen(true);
            setActive(-1);
            if (chosen) {
              setChosen(null);
              onChange?.(null);
            }
          }}
          onFocus={() => setOpen(true)}
          onBlur={() => {
            // a click on an option lands before the blur closes the list (mousedown is prevented there)
            setOpen(false);
            setActive(-1);
          }}
          onKeyDown={onKeyDown}
        />
        {chosen && (
          <button
            type="button"
            className="btn-quiet"
            onClick={() => {
              choose(null);
              inputRef.current?.focus();
            }}
          >
            Clear<span className="sr-only"> {label}</span>
          </button>
        )}
      </div>
      <ul
        id={listId}
        role="listbox"
        aria-label={label}
        hidden={!open || rows.length === 0}
        className="absolute z-20 mt-1 max-h-72 w-full overflow-y-auto rounded-card border border-paper-edge bg-white shadow"
      >
        {rows.map((r, i) => (
          <li
            key={r.id}
            id={`${listId}-${r.id}`}
            role="option"
            aria-selected={i === active}
            className={`min-h-touch cursor-pointer px-3 py-2 ${i === active ? "bg-wing-100" : ""}`}
            onMouseDown={(e) => e.preventDefault()}
            onClick={() => choose(r)}
          >
            {r.name}
            {r.detail && <span className="ml-2 text-caption text-ink-soft">{r.detail}</span>}
          </li>
        ))}
      </ul>
      <p id={statusId} className="sr-only" aria-live="polite" role="status">
        {status}
      </p>
      {error && (
        <p id={errorId} className="field-error">
          {label}: {error}
        </p>
      )}
    </div>
  );
}

export interface ChoiceFieldProps extends Omit<SearchPickerProps, "initial"> {
  choices: PickerChoices;
  /** the chosen id at first; with a search picker, `initial` gives its name */
  defaultValue?: string;
  initial?: PickerOption | null;
  /** the <select>'s first, empty option ("Choose a student", "Any cohort"); none: the first choice is chosen */
  emptyLabel?: string;
}

/**
 * One field over a growing set: a plain <select> while the set is small (PICKER_LIST_MAX or fewer),
 * the search picker above it. Both submit the chosen id under `name`.
 */
export function ChoiceField({ choices, defaultValue, initial, emptyLabel, ...picker }: ChoiceFieldProps) {
  if (choices.kind === "search") return <SearchPicker {...picker} initial={initial ?? null} />;
  const { id, name, label, error, onChange, className } = picker;
  const errorId = `${id}-error`;
  return (
    <div className={className}>
      <label htmlFor={id} className="field-label">
        {label}
      </label>
      <select
        id={id}
        name={name}
        defaultValue={defaultValue ?? ""}
        className="field-input"
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? errorId : undefined}
        onChange={(e) => onChange?.(choices.rows.find((r) => r.id === e.target.value) ?? null)}
      >
        {emptyLabel !== undefined && <option value="">{emptyLabel}</option>}
        {choices.rows.map((r) => (
          <option key={r.id} value={r.id}>
            {r.name}
            {r.detail ? ` (${r.detail})` : ""}
          </option>
        ))}
      </select>
      {error && (
        <p id={errorId} className="field-error">
          {label}: {error}
        </p>
      )}
    </div>
  );
}

export interface MultiSearchPickerProps extends Omit<SearchPickerProps, "initial" | "onChange"> {
  /** the choices made so far */
  value: PickerOption[];
  onChange: (choices: PickerOption[]) => void;
}

/**
 * Several choices from a growing set: the search picker adds one at a time to a list with a
 * Remove button each. Each chosen id is submitted under `name` (one hidden input per choice).
 */
export function MultiSearchPicker({ value, onChange, name, label, ...picker }: MultiSearchPickerProps) {
  const [round, setRound] = useState(0);
  return (
    <div className="space-y-2">
      <SearchPicker
        key={round}
        {...picker}
        name={`${name}Search`}
        label={label}
        onChange={(c) => {
          if (!c) return;
          if (!value.some((v) => v.id === c.id)) onChange([...value, c]);
          // an empty picker for the next one
          setRound((r) => r + 1);
        }}
      />
      {value.map((v) => (
        <input key={v.id} type="hidden" name={name} value={v.id} />
      ))}
      {value.length > 0 && (
        <ul aria-label={`${label}: chosen`} className="flex flex-wrap gap-2">
          {value.map((v) => (
            <li key={v.id} className="flex items-center gap-1 rounded-card border border-paper-edge pl-2">
              {v.name}
              {v.detail && <span className="text-caption text-ink-soft">· {v.detail}</span>}
              <button type="button" className="btn-quiet" onClick={() => onChange(value.filter((x) => x.id !== v.id))}>
                Remove<span className="sr-only"> {v.name}</span>
              </button>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
