import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type CreationOptional } from "sequelize";
import { sequelize } from "../index";

/** One configuration's numbers: its zero-lift drag increment over clean and its CLmax. */
export interface AirframeConfigurationValues {
  cd0Increment: number;
  maxLiftCoefficient: number;
}
/** Clean is always present; the others are null when the type has no such configuration. */
export interface AirframeConfigurations {
  clean: AirframeConfigurationValues;
  gearDown: AirframeConfigurationValues | null;
  flaps1: AirframeConfigurationValues | null;
  flaps2: AirframeConfigurationValues | null;
}

/** A school-owned aircraft profile, stored in SI units. */
export class Airframe extends Model<InferAttributes<Airframe>, InferCreationAttributes<Airframe>> {
  declare id: CreationOptional<string>;
  declare schoolId: string;
  declare name: string;
  declare emptyMassKg: number;
  declare maxMassKg: number;
  declare wingAreaM2: number;
  declare wingSpanM: number;
  declare oswaldEfficiency: number;
  declare zeroLiftDragCoefficient: number;
  declare configurations: AirframeConfigurations;
  declare notes: string;
  declare createdBy: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare retiredAt: Date | null;
}
Airframe.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    schoolId: { type: DataTypes.UUID, allowNull: false },
    name: { type: DataTypes.TEXT, allowNull: false },
    emptyMassKg: { type: DataTypes.DOUBLE, allowNull: false },
    maxMassKg: { type: DataTypes.DOUBLE, allowNull: false },
    wingAreaM2: { type: DataTypes.DOUBLE, allowNull: false },
    wingSpanM: { type: DataTypes.DOUBLE, allowNull: false },
    oswaldEfficiency: { type: DataTypes.DOUBLE, allowNull: false },
    zeroLiftDragCoefficient: { type: DataTypes.DOUBLE, allowNull: false },
    configurations: { type: DataTypes.JSONB, allowNull: false },
    notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
    createdBy: { type: DataTypes.UUID, allowNull: false },
    createdAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    updatedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
    retiredAt: { type: DataTypes.DATE, allowNull: true },
  },
  { sequelize, tableName: "airframes" },
);
