import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type CreationOptional } from "sequelize";
import { sequelize } from "../index";

import type { AttendanceStatusName } from "@/lib/timetable/schema";

export type AttendanceStatus = AttendanceStatusName;

/** An append-only ground-training record; corrections are new entries that amend an earlier one. */
export class GroundLogEntry extends Model<InferAttributes<GroundLogEntry>, InferCreationAttributes<GroundLogEntry>> {
  declare id: CreationOptional<string>;
  declare schoolId: string;
  declare studentId: string;
  declare courseId: string;
  declare sessionId: string;
  declare briefingRevisionId: string;
  declare syllabusItemIds: string[];
  declare instructorId: string;
  declare status: AttendanceStatus;
  declare lateMinutes: number;
  declare earlyMinutes: number;
  declare creditedMinutes: number;
  declare occurredAt: Date;
  declare recordedAt: CreationOptional<Date>;
  declare recordedBy: string;
  declare amendsEntryId: string | null;
  declare reason: string | null;
}
GroundLogEntry.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    schoolId: { type: DataTypes.UUID, allowNull: false },
    studentId: { type: DataTypes.UUID, allowNull: false },
    courseId: { type: DataTypes.UUID, allowNull: false },
    sessionId: { type: DataTypes.UUID, allowNull: false },
    briefingRevisionId: { type: DataTypes.UUID, allowNull: false },
    syllabusItemIds: { type: DataTypes.ARRAY(DataTypes.UUID), allowNull: false },
    instructorId: { type: DataTypes.UUID, allowNull: false },
    status: { type: DataTypes.TEXT, allowNull: false },
    lateMinutes: { type: DataTypes.INTEGER, allowNull: false },
    earlyMinutes: { type: DataTypes.INTEGER, allowNull: false },
    creditedMinutes: { type: DataTypes.INTEGER, allowNull: false },
    occurredAt: { type: DataTypes.DATE, allowNull: false },
    recordedAt: { type: DataTypes.DATE, defaultValue: DataTypes.NOW },
    recordedBy: { type: DataTypes.UUID, allowNull: false },
    amendsEntryId: { type: DataTypes.UUID, allowNull: true },
    reason: { type: DataTypes.TEXT, allowNull: true },
  },
  { sequelize, tableName: "ground_log_entries" },
);

export type MakeupState = "open" | "scheduled" | "done" | "waived";

export class MakeupItem extends Model<InferAttributes<MakeupItem>, InferCreationAttributes<MakeupItem>> {
  declare id: CreationOptional<string>;
  declare schoolId: string;
  declare studentId: string;
  declare syllabusItemId: string;
  declare sourceKind: "absence" | "stage_check";
  declare sourceId: string;
  declare state: CreationOptional<MakeupState>;
  declare scheduledSessionId: string | null;
  declare closedByKind: string | null;
  declare closedById: string | null;
  declare waivedReason: string | null;
  declare waivedBy: string | null;
  declare note: CreationOptional<string>;
  declare createdAt: CreationOptional<Date>;
  declare closedAt: Date | null;
}
MakeupItem.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    schoolId: { type: DataTypes.UUID, allowNull: false },
    studentId: { type: DataTypes.UUID, allowNull: false },
    syllabusItemId: { type: DataTypes.UUID, allowNull: false },
    sourceKind: { type: DataTypes.TEXT, allowNull: false },
    sourceId: { type: DataTypes.UUID, allowNull: false },
    state: { type: DataTypes.TEXT, allowNull: false, defaultValue: "open" },
    scheduledSessionId: { type: DataTypes.UUID, allowNull: true },
    closedByKind: { type: DataTypes.TEXT, allowNull: true },
    closedById: { type: DataTypes.UUID, allowNull: true },
    waivedReason: { type: DataTypes.TEXT, allowNull: true },
    waivedBy: { type: DataTypes.UUID, allowNull: true },
    note: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
    createdAt: { type: DataTypes.DATE, defaultValue: DataTypes.NOW },
    closedAt: { type: DataTypes.DATE, allowNull: true },
  },
  { sequelize, tableName: "makeup_items" },
);
