import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type CreationOptional } from "sequelize";
import { sequelize } from "../index";

export class Cohort extends Model<InferAttributes<Cohort>, InferCreationAttributes<Cohort>> {
  declare id: CreationOptional<string>;
  declare schoolId: string;
  declare courseId: string;
  declare name: string;
  declare leadInstructorId: string;
  declare startsOn: string;
}
Cohort.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    schoolId: { type: DataTypes.UUID, allowNull: false },
    courseId: { type: DataTypes.UUID, allowNull: false },
    name: { type: DataTypes.TEXT, allowNull: false },
    leadInstructorId: { type: DataTypes.UUID, allowNull: false },
    startsOn: { type: DataTypes.DATEONLY, allowNull: false },
  },
  { sequelize, tableName: "cohorts" },
);

export class CohortMembership extends Model<InferAttributes<CohortMembership>, InferCreationAttributes<CohortMembership>> {
  declare id: CreationOptional<string>;
  declare cohortId: string;
  declare studentId: string;
  declare fromDate: string;
  declare toDate: string | null;
}
CohortMembership.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    cohortId: { type: DataTypes.UUID, allowNull: false },
    studentId: { type: DataTypes.UUID, allowNull: false },
    fromDate: { type: DataTypes.DATEONLY, allowNull: false },
    toDate: { type: DataTypes.DATEONLY, allowNull: true },
  },
  { sequelize, tableName: "cohort_memberships" },
);

export type EnrolmentStatus = "active" | "completed" | "withdrawn" | "suspended";

export class Enrolment extends Model<InferAttributes<Enrolment>, InferCreationAttributes<Enrolment>> {
  declare id: CreationOptional<string>;
  declare studentId: string;
  declare courseId: string;
  declare revisionId: string;
  declare enrolledOn: string;
  declare status: EnrolmentStatus;
  declare endedOn: string | null;
  declare endReason: string | null;
}
Enrolment.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    studentId: { type: DataTypes.UUID, allowNull: false },
    courseId: { type: DataTypes.UUID, allowNull: false },
    revisionId: { type: DataTypes.UUID, allowNull: false },
    enrolledOn: { type: DataTypes.DATEONLY, allowNull: false },
    status: { type: DataTypes.TEXT, allowNull: false },
    endedOn: { type: DataTypes.DATEONLY, allowNull: true },
    endReason: { type: DataTypes.TEXT, allowNull: true },
  },
  { sequelize, tableName: "enrolments" },
);

export class SponsorLink extends Model<InferAttributes<SponsorLink>, InferCreationAttributes<SponsorLink>> {
  declare id: CreationOptional<string>;
  declare sponsorId: string;
  declare studentId: string;
  declare relationship: string;
  declare sharesAttendance: boolean;
  declare sharesHours: boolean;
  declare sharesProgress: boolean;
  declare sharesSchedule: boolean;
  declare weeklyLetter: boolean;
}
SponsorLink.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    sponsorId: { type: DataTypes.UUID, allowNull: false },
    studentId: { type: DataTypes.UUID, allowNull: false },
    relationship: { type: DataTypes.TEXT, allowNull: false },
    sharesAttendance: { type: DataTypes.BOOLEAN, allowNull: false },
    sharesHours: { type: DataTypes.BOOLEAN, allowNull: false },
    sharesProgress: { type: DataTypes.BOOLEAN, allowNull: false },
    sharesSchedule: { type: DataTypes.BOOLEAN, allowNull: false },
    weeklyLetter: { type: DataTypes.BOOLEAN, allowNull: false },
  },
  { sequelize, tableName: "sponsor_links" },
);
