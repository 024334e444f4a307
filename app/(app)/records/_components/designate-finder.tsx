"use client";
import { useState } from "react";
import { SearchPicker } from "@/components/search-picker";
import { DESIGNATED_DETAIL, type PickerOption } from "@/lib/directory/picker";
import { DesignateToggle } from "./designate-toggle";

// Records' Check instructors when the school has more instructors than a list holds: find one by
// name (GET /api/directory/instructors, purpose "designate") and designate or stop designating them.

export function DesignateFinder() {
  const [choice, setChoice] = useState<PickerOption | null>(null);
  return (
    <div className="space-y-2">
      <SearchPicker
        id="designate-instructor"
        name="personId"
        label="Instructor's name"
        endpoint="/api/directory/instructors"
        params={{ purpose: "designate" }}
        onChange={setChoice}
      />
      {choice && (
        <p className="flex flex-wrap items-center justify-between gap-2" data-testid="designate-choice">
          <span>{choice.name}</span>
          <DesignateToggle
            key={choice.id}
            personId={choice.id}
            name={choice.name}
            designated={choice.detail === DESIGNATED_DETAIL}
            onChanged={(designated) =>
              setChoice(designated ? { ...choice, detail: DESIGNATED_DETAIL } : { id: choice.id, name: choice.name })
            }
          />
        </p>
      )}
    </div>
  );
}
