import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type CreationOptional } from "sequelize";
import { sequelize } from "../index";

export interface SchoolSettings {
  /** A sign-off may rest on an oral check no older than this many days. */
  checkValidityDays?: number;
  /** Pass mark for the written part of a stage check, percent. */
  stageCheckPassMarkPercent?: number;
  /** Records entered more than this many days after the event raise a watch note. */
  lateEntryDays?: number;
  mailSenderName?: string;
  reminderLeadHours?: number;
  /** 0 = Sunday … 6 = Saturday */
  weeklyLetterDay?: number;
  authority?: string;
  /** The date of the students' knowledge test ("yyyy-MM-dd"), shown beside the practice test when set. */
  knowledgeTestOn?: string;
  /** The school's own certificate number (14 CFR 141.95(b)), printed on graduation certificates. */
  schoolCertificateNumber?: string;
}

export class School extends Model<InferAttributes<School>, InferCreationAttributes<School>> {
  declare id: CreationOptional<string>;
  declare name: string;
  declare timeZone: string;
  declare settings: SchoolSettings;
  declare createdAt: CreationOptional<Date>;
}

School.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    name: { type: DataTypes.TEXT, allowNull: false },
    timeZone: { type: DataTypes.TEXT, allowNull: false },
    settings: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
    createdAt: { type: DataTypes.DATE, defaultValue: DataTypes.NOW },
  },
  { sequelize, tableName: "schools" },
);
