import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { now } from "@/lib/clock";
import { REFERENCE_AIRCRAFT, type AircraftSnapshot } from "@/lib/records/questions";

// What an oral check may refer to: the aircraft a generated question can use, and the
// student's recent sessions (the optional session link).

interface DemoAirframe {
  name: string;
  emptyMassKg?: number;
  maxMassKg: number;
  wingAreaM2: number;
  wingSpanM: number;
  oswaldEfficiency: number;
  zeroLiftDragCoefficient: number;
  configurations?: { clean?: { maxLiftCoefficient?: number } };
}

/** The profile's clean CLmax when it gives one; nothing otherwise (never an invented value). */
function cleanMaxLift(v: unknown): { maxLiftCoefficient?: number } {
  return typeof v === "number" && Number.isFinite(v) && v > 0 ? { maxLiftCoefficient: v } : {};
}

/**
 * Aircraft a question may be generated for: first the aircraft of the demos used in the
 * briefings of the student's recent sessions (frozen in the demo revision), then the school's
 * airframes (Curve Lab), then the reference aircraft.
 */
export async function listQuestionAircraft(schoolId: string, t?: Transaction, studentId?: string): Promise<AircraftSnapshot[]> {
  const out: AircraftSnapshot[] = [];
  if (studentId) {
    const demos = await sequelize.query<{ id: string; demo_name: string; title: string; airframe: DemoAirframe | null }>(
      `SELECT DISTINCT ON (dr.id) dr.id, d.name AS demo_name, br.title, dr.spec->'airframe' AS airframe
         FROM session_attendees a JOIN training_sessions s ON s.id = a.session_id
         JOIN briefing_revisions br ON br.id = s.briefing_revision_id
         JOIN briefing_revision_demos bd ON bd.briefing_revision_id = s.briefing_revision_id
         JOIN demo_revisions dr ON dr.id = bd.demo_revision_id JOIN demos d ON d.id = dr.demo_id
        WHERE a.student_id = :studentId AND s.school_id = :schoolId AND s.status = 'scheduled' AND s.starts_at > CAST(:now AS timestamptz) - interval '90 days'
        ORDER BY dr.id, s.starts_at DESC`,
      { replacements: { studentId, schoolId, now: now() }, type: QueryTypes.SELECT, transaction: t },
    );
    for (const d of demos) {
      const a = d.airframe;
      if (!a || typeof a.wingAreaM2 !== "number") continue;
      out.push({
        name: `${a.name}, demo "${d.demo_name}" in ${d.title}`,
        source: { kind: "demo", id: d.id },
        aircraft: {
          massKg: a.maxMassKg,
          wingAreaM2: a.wingAreaM2,
          wingSpanM: a.wingSpanM,
          zeroLiftDragCoefficient: a.zeroLiftDragCoefficient,
          oswaldEfficiency: a.oswaldEfficiency,
          // no invented CLmax: a profile without one is asked no stall-based question
          ...cleanMaxLift(a.configurations?.clean?.maxLiftCoefficient),
        },
        limits: { emptyMassKg: a.emptyMassKg ?? a.maxMassKg, maxMassKg: a.maxMassKg },
      });
    }
  }
  const rows = await sequelize.query<{
    id: string;
    name: string;
    empty_mass_kg: number;
    max_mass_kg: number;
    wing_area_m2: number;
    wing_span_m: number;
    oswald_efficiency: number;
    zero_lift_drag_coefficient: number;
    configurations: { clean?: { cd0Increment?: number; maxLiftCoefficient?: number } };
  }>(`SELECT * FROM airframes WHERE school_id = :schoolId AND retired_at IS NULL ORDER BY name`, {
    replacements: { schoolId },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  for (const r of rows) {
    out.push({
      name: r.name,
      source: { kind: "airframe", id: r.id },
      aircraft: {
        massKg: r.max_mass_kg,
        wingAreaM2: r.wing_area_m2,
        wingSpanM: r.wing_span_m,
        zeroLiftDragCoefficient: r.zero_lift_drag_coefficient + (r.configurations?.clean?.cd0Increment ?? 0),
        oswaldEfficiency: r.oswald_efficiency,
        ...cleanMaxLift(r.configurations?.clean?.maxLiftCoefficient),
      },
      limits: { emptyMassKg: r.empty_mass_kg, maxMassKg: r.max_mass_kg },
    });
  }
  return [...out, ...REFERENCE_AIRCRAFT];
}

/** Sessions of the student in the last 90 days that have started, newest first (for the optional session link). */
export async function recentSessionsOf(
  studentId: string,
  schoolId: string,
  t?: Transaction,
): Promise<{ id: string; startsAt: Date; title: string }[]> {
  return sequelize.query<{ id: string; startsAt: Date; title: string }>(
    `SELECT s.id, s.starts_at AS "startsAt", br.title FROM session_attendees a JOIN training_sessions s ON s.id = a.session_id
       JOIN briefing_revisions br ON br.id = s.briefing_revision_id
      WHERE a.student_id = :studentId AND s.school_id = :schoolId AND s.status = 'scheduled'
        AND s.starts_at <= CAST(:now AS timestamptz) AND s.starts_at > CAST(:now AS timestamptz) - interval '90 days'
      ORDER BY s.starts_at DESC LIMIT 20`,
    { replacements: { studentId, schoolId, now: now() }, type: QueryTypes.SELECT, transaction: t },
  );
}
