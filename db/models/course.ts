import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type CreationOptional } from "sequelize";
import { sequelize } from "../index";

export type LevelOfLearning = "rote" | "understanding" | "application" | "correlation";
export const LEVELS_OF_LEARNING: readonly LevelOfLearning[] = ["rote", "understanding", "application", "correlation"];

export class Course extends Model<InferAttributes<Course>, InferCreationAttributes<Course>> {
  declare id: CreationOptional<string>;
  declare schoolId: string;
  declare code: string;
  declare title: string;
  declare minGroundMinutes: number;
}
Course.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    schoolId: { type: DataTypes.UUID, allowNull: false },
    code: { type: DataTypes.TEXT, allowNull: false },
    title: { type: DataTypes.TEXT, allowNull: false },
    minGroundMinutes: { type: DataTypes.INTEGER, allowNull: false },
  },
  { sequelize, tableName: "courses" },
);

export class SyllabusRevision extends Model<InferAttributes<SyllabusRevision>, InferCreationAttributes<SyllabusRevision>> {
  declare id: CreationOptional<string>;
  declare courseId: string;
  declare number: number;
  declare approvedOn: string | null;
  declare effectiveFrom: string | null;
  declare changeNote: string;
}
SyllabusRevision.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    courseId: { type: DataTypes.UUID, allowNull: false },
    number: { type: DataTypes.INTEGER, allowNull: false },
    approvedOn: { type: DataTypes.DATEONLY, allowNull: true },
    effectiveFrom: { type: DataTypes.DATEONLY, allowNull: true },
    changeNote: { type: DataTypes.TEXT, allowNull: false },
  },
  { sequelize, tableName: "syllabus_revisions" },
);

export class SyllabusStage extends Model<InferAttributes<SyllabusStage>, InferCreationAttributes<SyllabusStage>> {
  declare id: CreationOptional<string>;
  declare revisionId: string;
  declare position: number;
  declare code: string;
  declare title: string;
}
SyllabusStage.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    revisionId: { type: DataTypes.UUID, allowNull: false },
    position: { type: DataTypes.INTEGER, allowNull: false },
    code: { type: DataTypes.TEXT, allowNull: false },
    title: { type: DataTypes.TEXT, allowNull: false },
  },
  { sequelize, tableName: "syllabus_stages" },
);

export class SyllabusItem extends Model<InferAttributes<SyllabusItem>, InferCreationAttributes<SyllabusItem>> {
  declare id: CreationOptional<string>;
  declare revisionId: string;
  declare stageId: string;
  declare position: number;
  declare code: string;
  declare title: string;
  declare objective: string;
  declare completionStandard: string;
  declare requiredLevel: LevelOfLearning;
}
SyllabusItem.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    revisionId: { type: DataTypes.UUID, allowNull: false },
    stageId: { type: DataTypes.UUID, allowNull: false },
    position: { type: DataTypes.INTEGER, allowNull: false },
    code: { type: DataTypes.TEXT, allowNull: false },
    title: { type: DataTypes.TEXT, allowNull: false },
    objective: { type: DataTypes.TEXT, allowNull: false },
    completionStandard: { type: DataTypes.TEXT, allowNull: false },
    requiredLevel: { type: DataTypes.TEXT, allowNull: false },
  },
  { sequelize, tableName: "syllabus_items" },
);
