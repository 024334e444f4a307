import "server-only";
import type { Transaction } from "sequelize";
import { Airframe } from "../../models";
import { HttpError } from "@/lib/http/errors";
import { airframeView, type AirframeData, type AirframeView } from "./airframes";

// Aircraft profiles: creating, editing, duplicating and retiring them.

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
  return airframeView(a);
}

/**
 * Edits a profile in place. Demos already saved keep the numbers they snapshotted in their
 * revision, so what was taught does not change.
 */
export async function updateAirframe(schoolId: string, airframeId: string, d: AirframeData, t: Transaction): Promise<AirframeView> {
  const a = await mustGet(schoolId, airframeId, t);
  if (a.retiredAt) throw new HttpError(409, "airframeId: a retired profile cannot be edited; duplicate it instead", "airframeId");
  await a.update({ ...columns(d), updatedAt: new Date() }, { transaction: t });
  return airframeView(a);
}

export async function duplicateAirframe(schoolId: string, airframeId: string, createdBy: string, t: Transaction): Promise<AirframeView> {
  const a = await mustGet(schoolId, airframeId, t);
  const name = `Copy of ${a.name}`.slice(0, 120);
  return createAirframe(schoolId, createdBy, { ...columns(airframeView(a) as unknown as AirframeData & AirframeView), name }, t);
}

export async function setAirframeRetired(schoolId: string, airframeId: string, retired: boolean, t: Transaction): Promise<AirframeView> {
  const a = await mustGet(schoolId, airframeId, t);
  await a.update({ retiredAt: retired ? (a.retiredAt ?? new Date()) : null, updatedAt: new Date() }, { transaction: t });
  return airframeView(a);
}
