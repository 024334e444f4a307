import { ChoiceField } from "@/components/search-picker";
import type { PickerChoices, PickerOption } from "@/lib/directory/picker";

/** The Timetable's filters: a plain GET form, so the view's URL says what it shows. */
export function TimetableFilters({
  action,
  values,
  instructors,
  instructor,
  cohorts,
  cohort,
  rooms,
  hidden,
}: {
  action: string;
  values: { instructor?: string; cohort?: string; room?: string; mine?: string };
  /** listed while few, else searched (GET /api/directory/instructors) */
  instructors: PickerChoices;
  /** the instructor in the URL, named for the search picker */
  instructor?: PickerOption | null;
  /** listed while few, else searched (GET /api/directory/cohorts) */
  cohorts: PickerChoices;
  /** the cohort in the URL, named for the search picker */
  cohort?: PickerOption | null;
  rooms: string[];
  hidden?: Record<string, string>;
}) {
  return (
    <form method="get" action={action} className="card flex flex-wrap items-end gap-3" aria-label="Filter the Timetable">
      {Object.entries(hidden ?? {}).map(([k, v]) => (
        <input key={k} type="hidden" name={k} value={v} />
      ))}
      <ChoiceField
        className="min-w-40 flex-1"
        id="f-instructor"
        name="instructor"
        label="Instructor"
        emptyLabel="Any instructor"
        placeholder="Any instructor: type a name"
        choices={instructors}
        defaultValue={values.instructor}
        initial={instructor}
        endpoint="/api/directory/instructors"
        params={{ purpose: "timetable" }}
      />
      <ChoiceField
        className="min-w-40 flex-1"
        id="f-cohort"
        name="cohort"
        label="Cohort"
        emptyLabel="Any cohort"
        placeholder="Any cohort: type a name"
        choices={cohorts}
        defaultValue={values.cohort}
        initial={cohort}
        endpoint="/api/directory/cohorts"
        params={{ purpose: "timetable" }}
      />
      <div className="min-w-40 flex-1">
        <label htmlFor="f-room" className="field-label">
          Room
        </label>
        <select id="f-room" name="room" defaultValue={values.room ?? ""} className="field-input">
          <option value="">Any room</option>
          {rooms.map((r) => (
            <option key={r} value={r}>
              {r}
            </option>
          ))}
        </select>
      </div>
      <label className="flex min-h-touch items-center gap-2">
        <input type="checkbox" name="mine" value="1" defaultChecked={values.mine === "1"} className="h-5 w-5" />
        Only mine
      </label>
      <button type="submit" className="btn-quiet">
        Show
      </button>
    </form>
  );
}
