import { z } from "zod";
import { LIMITS, describeAspectRatioProblem, describeProblem, type NumberLimit } from "./limits";

/**
 * zod schemas for forms and API routes. They apply the same limits as the
 * library's runtime checks (lib/aero/limits.ts) and report the same message,
 * on the same field, as the AeroInputError the library would throw.
 */

function numberField(lim: NumberLimit) {
  const typeMessage = describeProblem(lim, Number.NaN) ?? `${lim.field} must be a number`;
  return z.number({ error: typeMessage }).superRefine((value, ctx) => {
    const message = describeProblem(lim, value);
    if (message !== null) ctx.addIssue({ code: "custom", message });
  });
}

export const aircraftSchema = z
  .object({
    massKg: numberField(LIMITS.massKg),
    wingAreaM2: numberField(LIMITS.wingAreaM2),
    wingSpanM: numberField(LIMITS.wingSpanM),
    zeroLiftDragCoefficient: numberField(LIMITS.zeroLiftDragCoefficient),
    oswaldEfficiency: numberField(LIMITS.oswaldEfficiency),
    maxLiftCoefficient: numberField(LIMITS.maxLiftCoefficient),
  })
  .superRefine((a, ctx) => {
    const message = describeAspectRatioProblem(a.wingSpanM, a.wingAreaM2);
    if (message !== null) ctx.addIssue({ code: "custom", message, path: ["wingSpanM"] });
  });

export const atmosphereConditionsSchema = z.object({
  altitudeM: numberField(LIMITS.altitudeM),
  isaDeviationK: numberField(LIMITS.isaDeviationK).optional(),
});

export const flightConditionsSchema = z.object({
  altitudeM: numberField(LIMITS.altitudeM),
  isaDeviationK: numberField(LIMITS.isaDeviationK).optional(),
  trueAirspeedMs: numberField(LIMITS.trueAirspeedMs).optional(),
  loadFactor: numberField(LIMITS.loadFactor).optional(),
});

/** Conditions for calls at a given speed (dragAt, speedStability). */
export const speedConditionsSchema = flightConditionsSchema.extend({
  trueAirspeedMs: numberField(LIMITS.trueAirspeedMs),
});

export const curveCaseSchema = flightConditionsSchema.omit({ trueAirspeedMs: true }).extend({
  aircraft: aircraftSchema,
});

export const curveRangeSchema = z
  .object({
    minSpeedMs: numberField(LIMITS.minSpeedMs),
    maxSpeedMs: numberField(LIMITS.maxSpeedMs),
    points: numberField(LIMITS.points),
    speedAxis: z.enum(["equivalent", "true"]).optional(),
  })
  .superRefine((r, ctx) => {
    if (!(r.maxSpeedMs > r.minSpeedMs)) {
      ctx.addIssue({ code: "custom", message: "maxSpeedMs must be greater than minSpeedMs", path: ["maxSpeedMs"] });
    }
  });

export type AircraftInput = z.infer<typeof aircraftSchema>;
export type FlightConditionsInput = z.infer<typeof flightConditionsSchema>;
export type SpeedConditionsInput = z.infer<typeof speedConditionsSchema>;
export type CurveCaseInput = z.infer<typeof curveCaseSchema>;
export type CurveRangeInput = z.infer<typeof curveRangeSchema>;
