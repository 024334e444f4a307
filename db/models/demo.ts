import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type CreationOptional } from "sequelize";
import { sequelize } from "../index";

/** A saved demo: the parent row; what it shows lives in numbered revisions. */
export class Demo extends Model<InferAttributes<Demo>, InferCreationAttributes<Demo>> {
  declare id: CreationOptional<string>;
  declare schoolId: string;
  declare name: string;
  declare ownerId: string;
  declare currentRevisionId: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare deletedAt: Date | null;
}
Demo.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    schoolId: { type: DataTypes.UUID, allowNull: false },
    name: { type: DataTypes.TEXT, allowNull: false },
    ownerId: { type: DataTypes.UUID, allowNull: false },
    currentRevisionId: { type: DataTypes.UUID, allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    updatedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    deletedAt: { type: DataTypes.DATE, allowNull: true },
  },
  { sequelize, tableName: "demos" },
);

/** One numbered revision of a demo; its spec (jsonb) snapshots the airframe's numbers. */
export class DemoRevision extends Model<InferAttributes<DemoRevision>, InferCreationAttributes<DemoRevision>> {
  declare id: CreationOptional<string>;
  declare demoId: string;
  declare number: number;
  declare spec: unknown;
  declare createdBy: string;
  declare createdAt: CreationOptional<Date>;
}
DemoRevision.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    demoId: { type: DataTypes.UUID, allowNull: false },
    number: { type: DataTypes.INTEGER, allowNull: false },
    spec: { type: DataTypes.JSONB, allowNull: false },
    createdBy: { type: DataTypes.UUID, allowNull: false },
    createdAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
  },
  { sequelize, tableName: "demo_revisions" },
);

export type CallMarkerKind = "vmd" | "stall" | "gust";

/** A student's Call it first attempt (append-only). Speeds in m/s on the revision's axis. */
export class DemoCall extends Model<InferAttributes<DemoCall>, InferCreationAttributes<DemoCall>> {
  declare id: CreationOptional<string>;
  declare schoolId: string;
  declare demoRevisionId: string;
  declare studentId: string;
  declare markerKind: CallMarkerKind;
  declare speedAxis: "equivalent" | "true";
  declare predictedMs: number;
  declare actualMs: number;
  declare errorMs: number;
  declare createdAt: CreationOptional<Date>;
}
DemoCall.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    schoolId: { type: DataTypes.UUID, allowNull: false },
    demoRevisionId: { type: DataTypes.UUID, allowNull: false },
    studentId: { type: DataTypes.UUID, allowNull: false },
    markerKind: { type: DataTypes.TEXT, allowNull: false },
    speedAxis: { type: DataTypes.TEXT, allowNull: false },
    predictedMs: { type: DataTypes.DOUBLE, allowNull: false },
    actualMs: { type: DataTypes.DOUBLE, allowNull: false },
    errorMs: { type: DataTypes.DOUBLE, allowNull: false },
    createdAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
  },
  { sequelize, tableName: "demo_calls" },
);
