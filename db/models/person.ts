import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type CreationOptional } from "sequelize";
import { sequelize } from "../index";
import type { Role } from "@/lib/auth/roles";

export class Person extends Model<InferAttributes<Person>, InferCreationAttributes<Person>> {
  declare id: CreationOptional<string>;
  declare schoolId: string;
  declare name: string;
  declare email: string;
  declare passwordHash: string | null;
  declare roles: Role[];
  declare sessionVersion: CreationOptional<number>;
  declare active: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

Person.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    schoolId: { type: DataTypes.UUID, allowNull: false },
    name: { type: DataTypes.TEXT, allowNull: false },
    email: { type: DataTypes.TEXT, allowNull: false },
    passwordHash: { type: DataTypes.TEXT, allowNull: true },
    roles: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false },
    sessionVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    createdAt: { type: DataTypes.DATE, defaultValue: DataTypes.NOW },
    updatedAt: { type: DataTypes.DATE, defaultValue: DataTypes.NOW },
  },
  { sequelize, tableName: "people" },
);

export class InstructorQualification extends Model<
  InferAttributes<InstructorQualification>,
  InferCreationAttributes<InstructorQualification>
> {
  declare id: CreationOptional<string>;
  declare personId: string;
  declare certificateKind: string;
  declare certificateNumber: string;
  declare ratings: string[];
  declare checkInstructor: boolean;
  declare issuedOn: string;
  declare recencyOn: string;
  declare recencyMonths: number;
}

InstructorQualification.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    personId: { type: DataTypes.UUID, allowNull: false },
    certificateKind: { type: DataTypes.TEXT, allowNull: false },
    certificateNumber: { type: DataTypes.TEXT, allowNull: false },
    ratings: { type: DataTypes.ARRAY(DataTypes.TEXT), allowNull: false },
    checkInstructor: { type: DataTypes.BOOLEAN, allowNull: false },
    issuedOn: { type: DataTypes.DATEONLY, allowNull: false },
    recencyOn: { type: DataTypes.DATEONLY, allowNull: false },
    recencyMonths: { type: DataTypes.INTEGER, allowNull: false },
  },
  { sequelize, tableName: "instructor_qualifications" },
);
