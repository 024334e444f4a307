import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { AircraftSnapshot } from "@/lib/records/questions";
import { listAssignedDemosForStudent } from "../assignments/assigned-to-student";

// What a student may practise on: the demos assigned to them (directly or through a briefing),
// each with the aircraft frozen in the demo revision and the syllabus items that the briefings
// using that revision teach.

export interface PracticeTopic {
  demoId: string;
  demoRevisionId: string;
  demoName: string;
  snapshot: AircraftSnapshot;
  items: { id: string; code: string; title: string }[];
}

export interface DemoAirframe {
  name?: string;
  emptyMassKg?: number;
  maxMassKg?: number;
  wingAreaM2?: number;
  wingSpanM?: number;
  oswaldEfficiency?: number;
  zeroLiftDragCoefficient?: number;
  configurations?: { clean?: { maxLiftCoefficient?: number } };
}

const num = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v) && v > 0;

export function snapshotOfDemo(demoRevisionId: string, demoName: string, a: DemoAirframe | null): AircraftSnapshot | null {
  if (!a || !num(a.maxMassKg) || !num(a.wingAreaM2) || !num(a.wingSpanM) || !num(a.oswaldEfficiency) || !num(a.zeroLiftDragCoefficient))
    return null;
  const clmax = a.configurations?.clean?.maxLiftCoefficient;
  return {
    name: `${a.name ?? "Aircraft"} (demo “${demoName}”)`,
    source: { kind: "demo", id: demoRevisionId },
    aircraft: {
      massKg: a.maxMassKg,
      wingAreaM2: a.wingAreaM2,
      wingSpanM: a.wingSpanM,
      zeroLiftDragCoefficient: a.zeroLiftDragCoefficient,
      oswaldEfficiency: a.oswaldEfficiency,
      // no invented CLmax: without one, no stall-based question
      ...(num(clmax) ? { maxLiftCoefficient: clmax } : {}),
    },
    limits: { emptyMassKg: num(a.emptyMassKg) ? a.emptyMassKg : a.maxMassKg, maxMassKg: a.maxMassKg },
  };
}

/** The student's own practice topics (assigned demos with an aircraft), by demo name. */
export async function practiceTopicsFor(schoolId: string, studentId: string): Promise<PracticeTopic[]> {
  const assigned = await listAssignedDemosForStudent(schoolId, studentId);
  const revisions = [...new Map(assigned.map((a) => [a.demoRevisionId, a])).values()];
  if (revisions.length === 0) return [];
  const specs = await sequelize.query<{ id: string; airframe: DemoAirframe | null }>(
    `SELECT id, spec->'airframe' AS airframe FROM demo_revisions WHERE id = ANY(ARRAY[:ids]::uuid[])`,
    { replacements: { ids: revisions.map((r) => r.demoRevisionId) }, type: QueryTypes.SELECT },
  );
  const items = await sequelize.query<{ demoRevisionId: string; id: string; code: string; title: string }>(
    `SELECT DISTINCT bd.demo_revision_id AS "demoRevisionId", i.id, i.code, i.title
       FROM briefing_revision_demos bd JOIN briefing_revision_items bi ON bi.briefing_revision_id = bd.briefing_revision_id
       JOIN syllabus_items i ON i.id = bi.syllabus_item_id
      WHERE bd.demo_revision_id = ANY(ARRAY[:ids]::uuid[])
      ORDER BY i.code`,
    { replacements: { ids: revisions.map((r) => r.demoRevisionId) }, type: QueryTypes.SELECT },
  );
  const out: PracticeTopic[] = [];
  for (const r of revisions) {
    const snapshot = snapshotOfDemo(r.demoRevisionId, r.name, specs.find((s) => s.id === r.demoRevisionId)?.airframe ?? null);
    if (!snapshot) continue;
    out.push({
      demoId: r.demoId,
      demoRevisionId: r.demoRevisionId,
      demoName: r.name,
      snapshot,
      items: items.filter((i) => i.demoRevisionId === r.demoRevisionId).map(({ id, code, title }) => ({ id, code, title })),
    });
  }
  return out.sort((a, b) => a.demoName.localeCompare(b.demoName));
}
