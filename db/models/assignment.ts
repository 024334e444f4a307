import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type CreationOptional } from "sequelize";
import { sequelize } from "../index";

export type AssignmentKind = "briefing" | "demo";

/** A briefing or a demo to review by a calendar date, for a cohort or one student. Overdue is derived, never stored. */
export class Assignment extends Model<InferAttributes<Assignment>, InferCreationAttributes<Assignment>> {
  declare id: CreationOptional<string>;
  declare schoolId: string;
  declare kind: AssignmentKind;
  declare briefingId: string | null;
  declare demoId: string | null;
  declare cohortId: string | null;
  declare studentId: string | null;
  declare dueOn: string;
  declare note: string;
  declare assignedBy: string;
  declare createdAt: CreationOptional<Date>;
}
Assignment.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    schoolId: { type: DataTypes.UUID, allowNull: false },
    kind: { type: DataTypes.TEXT, allowNull: false },
    briefingId: { type: DataTypes.UUID, allowNull: true },
    demoId: { type: DataTypes.UUID, allowNull: true },
    cohortId: { type: DataTypes.UUID, allowNull: true },
    studentId: { type: DataTypes.UUID, allowNull: true },
    dueOn: { type: DataTypes.DATEONLY, allowNull: false },
    note: { type: DataTypes.TEXT, allowNull: false },
    assignedBy: { type: DataTypes.UUID, allowNull: false },
    createdAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
  },
  { sequelize, tableName: "assignments" },
);

export class AssignmentCompletion extends Model<InferAttributes<AssignmentCompletion>, InferCreationAttributes<AssignmentCompletion>> {
  declare assignmentId: string;
  declare studentId: string;
  declare completedAt: Date;
}
AssignmentCompletion.init(
  {
    assignmentId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
    studentId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
    completedAt: { type: DataTypes.DATE, allowNull: false },
  },
  { sequelize, tableName: "assignment_completions" },
);
