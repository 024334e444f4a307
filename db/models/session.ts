import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type CreationOptional } from "sequelize";
import { sequelize } from "../index";

export type SessionStatus = "scheduled" | "cancelled";

/** A scheduled briefing: one revision of a briefing, at a time, in a room, with an instructor. */
export class TrainingSession extends Model<InferAttributes<TrainingSession>, InferCreationAttributes<TrainingSession>> {
  declare id: CreationOptional<string>;
  declare schoolId: string;
  declare briefingId: string;
  declare briefingRevisionId: string;
  declare startsAt: Date;
  declare endsAt: Date;
  /** the room's name, copied from rooms by a trigger (0560); roomId is the truth */
  declare room: CreationOptional<string>;
  declare roomId: string;
  declare instructorId: string;
  declare cohortId: string | null;
  declare status: CreationOptional<SessionStatus>;
  declare sequence: CreationOptional<number>;
  declare cancelReason: string | null;
  declare createdBy: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}
TrainingSession.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    schoolId: { type: DataTypes.UUID, allowNull: false },
    briefingId: { type: DataTypes.UUID, allowNull: false },
    briefingRevisionId: { type: DataTypes.UUID, allowNull: false },
    startsAt: { type: DataTypes.DATE, allowNull: false },
    endsAt: { type: DataTypes.DATE, allowNull: false },
    room: { type: DataTypes.TEXT, allowNull: true },
    roomId: { type: DataTypes.UUID, allowNull: false },
    instructorId: { type: DataTypes.UUID, allowNull: false },
    cohortId: { type: DataTypes.UUID, allowNull: true },
    status: { type: DataTypes.TEXT, allowNull: false, defaultValue: "scheduled" },
    sequence: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    cancelReason: { type: DataTypes.TEXT, allowNull: true },
    createdBy: { type: DataTypes.UUID, allowNull: false },
    createdAt: { type: DataTypes.DATE, defaultValue: DataTypes.NOW },
    updatedAt: { type: DataTypes.DATE, defaultValue: DataTypes.NOW },
  },
  { sequelize, tableName: "training_sessions" },
);

/** A student expected at a session; the range and status are copied from the session by triggers. */
export class SessionAttendee extends Model<InferAttributes<SessionAttendee>, InferCreationAttributes<SessionAttendee>> {
  declare sessionId: string;
  declare studentId: string;
  declare via: "cohort" | "individual";
}
SessionAttendee.init(
  {
    sessionId: { type: DataTypes.UUID, primaryKey: true },
    studentId: { type: DataTypes.UUID, primaryKey: true },
    via: { type: DataTypes.TEXT, allowNull: false },
  },
  { sequelize, tableName: "session_attendees" },
);
