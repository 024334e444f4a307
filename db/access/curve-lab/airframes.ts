import "server-only";
import type { Transaction } from "sequelize";
import { Op } from "sequelize";
import { Airframe, type AirframeConfigurations } from "../../models";
import type { AirframeSnapshot } from "@/lib/curve-lab/demo-spec";

// Aircraft profiles: reading them (lists, one profile). Changes are in save-airframe.ts.

/** An aircraft profile as pages and actions see it (SI units). */
export interface AirframeView {
  id: string;
  name: string;
  emptyMassKg: number;
  maxMassKg: number;
  wingAreaM2: number;
  wingSpanM: number;
  oswaldEfficiency: number;
  zeroLiftDragCoefficient: number;
  configurations: AirframeConfigurations;
  notes: string;
  retiredAt: string | null;
  updatedAt: string;
}

export type AirframeData = Omit<AirframeSnapshot, "id"> & { notes: string };

export function airframeView(a: Airframe): AirframeView {
  return {
    id: a.id,
    name: a.name,
    emptyMassKg: a.emptyMassKg,
    maxMassKg: a.maxMassKg,
    wingAreaM2: a.wingAreaM2,
    wingSpanM: a.wingSpanM,
    oswaldEfficiency: a.oswaldEfficiency,
    zeroLiftDragCoefficient: a.zeroLiftDragCoefficient,
    configurations: a.configurations,
    notes: a.notes,
    retiredAt: a.retiredAt ? a.retiredAt.toISOString() : null,
    updatedAt: a.updatedAt.toISOString(),
  };
}

export async function listAirframes(schoolId: string, opts: { includeRetired?: boolean } = {}): Promise<AirframeView[]> {
  const rows = await Airframe.findAll({
    where: { schoolId, ...(opts.includeRetired ? {} : { retiredAt: { [Op.is]: null } }) },
    order: [
      ["retiredAt", "DESC NULLS FIRST"],
      ["name", "ASC"],
    ],
  });
  return rows.map(airframeView);
}

export async function getAirframe(schoolId: string, airframeId: string, t?: Transaction): Promise<AirframeView | null> {
  const a = await Airframe.findOne({ where: { id: airframeId, schoolId }, transaction: t });
  return a ? airframeView(a) : null;
}
