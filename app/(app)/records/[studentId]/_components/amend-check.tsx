"use client";
import { useState } from "react";
import type { AircraftSnapshot } from "@/lib/records/questions";
import type { LevelOfLearning } from "@/lib/records/outcome";
import { CheckForm } from "./check-form";

/**
 * Opens the oral-check form to amend a check: the corrected check is recorded as a new one that
 * refers to the original, with a reason and the password; the original stays visible, struck through.
 */
export function AmendCheck(props: {
  checkId: string;
  studentId: string;
  items: { id: string; code: string; title: string; requiredLevel: LevelOfLearning }[];
  aircraft: AircraftSnapshot[];
  sessions: { id: string; label: string }[];
}) {
  const [open, setOpen] = useState(false);
  if (!open)
    return (
      <button type="button" className="btn-quiet" onClick={() => setOpen(true)}>
        Amend this check
      </button>
    );
  return (
    <div className="rounded-md border border-paper-edge p-3">
      <div className="flex items-center justify-between">
        <p className="font-semibold">Amend this check</p>
        <button type="button" className="btn-quiet" onClick={() => setOpen(false)}>
          Cancel
        </button>
      </div>
      <CheckForm
        studentId={props.studentId}
        items={props.items}
        aircraft={props.aircraft}
        sessions={props.sessions}
        amends={{ checkId: props.checkId }}
      />
    </div>
  );
}
