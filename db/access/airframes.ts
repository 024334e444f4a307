import "server-only";
import type { Transaction } from "sequelize";
import { Op } from "sequelize";
import { Airframe, type AirframeConfigurations } from "../models";
import { HttpError } from "@/lib/http/errors";
import type { AirframeSnapshot } from "@/components/charts/demo-spec";

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

function view(a: Airframe): AirframeView {
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

/** The airframe's numbers as a demo revision snapshots them. */
export function snapshotOf(a: AirframeView): AirframeSnapshot {
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
  return rows.map(view);
}

export async function getAirframe(schoolId: string, airframeId: string, t?: Transaction): Promise<AirframeView | null> {
  const a = await Airframe.findOne({ where: { id: airframeId, schoolId }, transaction: t });
  return a ? view(a) : null;
}

async function mustGet(schoolId: string, airframeId: string, t: Transaction): Promise<Airframe> {
  const a = await Airframe.findOne({ where: { id: airframeId, schoolId }, transaction: t, lock: t.LOCK.UPDATE });
  if (!a) throw new HttpError(404, "airframeId: no such aircraft profile", "airframeId");
  return a;
}

function columns(d: AirframeData) {
  return {
    name: d.name,
    emptyMassKg: d.emptyMassKg,
    maxMassKg: d.maxMassKg,
    wingAreaM2: d.wingAreaM2,
    wingSpanM: d.wingSpanM,
    oswaldEfficiency: d.oswaldEfficiency,
    zeroLiftDragCoefficient: d.zeroLiftDragCoefficient,
    configurations: d.configurations,
    notes: d.notes,
  };
}

export async function createAirframe(schoolId: string, createdBy: string, d: AirframeData, t: Transaction): Promise<AirframeView> {
  const a = await Airframe.create({ schoolId, createdBy, retiredAt: null, ...columns(d) }, { transaction: t });
  return view(a);
}

/**
 * Edits a profile in place. Demos already saved keep the numbers they snapshotted in their
 * revision, so what was taught does not change.
 */
export async function updateAirframe(schoolId: string, airframeId: string, d: AirframeData, t: Transaction): Promise<AirframeView> {
  const a = await mustGet(schoolId, airframeId, t);
  if (a.retiredAt) throw new HttpError(409, "airframeId: a retired profile cannot be edited; duplicate it instead", "airframeId");
  await a.update({ ...columns(d), updatedAt: new Date() }, { transaction: t });
  return view(a);
}

export async function duplicateAirframe(schoolId: string, airframeId: string, createdBy: string, t: Transaction): Promise<AirframeView> {
  const a = await mustGet(schoolId, airframeId, t);
  const name = `Copy of ${a.name}`.slice(0, 120);
  return createAirframe(schoolId, createdBy, { ...columns(view(a) as unknown as AirframeData & AirframeView), name }, t);
}

export async function setAirframeRetired(schoolId: string, airframeId: string, retired: boolean, t: Transaction): Promise<AirframeView> {
  const a = await mustGet(schoolId, airframeId, t);
  await a.update({ retiredAt: retired ? (a.retiredAt ?? new Date()) : null, updatedAt: new Date() }, { transaction: t });
  return view(a);
}
