import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type CreationOptional } from "sequelize";
import { sequelize } from "../index";

/** One ordered element of a briefing: what the instructor does, what the students do, and for how long. */
export interface BriefingElement {
  title: string;
  instructorActions: string;
  studentActions: string;
  minutes: number;
}

/** The parent of a briefing's numbered, immutable revisions. */
export class Briefing extends Model<InferAttributes<Briefing>, InferCreationAttributes<Briefing>> {
  declare id: CreationOptional<string>;
  declare schoolId: string;
  declare courseId: string;
  declare ownerId: string;
  declare currentRevisionId: string | null;
  declare createdAt: CreationOptional<Date>;
}
Briefing.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    schoolId: { type: DataTypes.UUID, allowNull: false },
    courseId: { type: DataTypes.UUID, allowNull: false },
    ownerId: { type: DataTypes.UUID, allowNull: false },
    currentRevisionId: { type: DataTypes.UUID, allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
  },
  { sequelize, tableName: "briefings" },
);

/** A revision is never changed: editing a briefing makes the next number. */
export class BriefingRevision extends Model<InferAttributes<BriefingRevision>, InferCreationAttributes<BriefingRevision>> {
  declare id: CreationOptional<string>;
  declare briefingId: string;
  declare number: number;
  declare title: string;
  declare objective: string;
  declare elements: BriefingElement[];
  declare equipment: string;
  declare completionStandard: string;
  declare syllabusRevisionId: string;
  declare changeNote: string;
  declare createdBy: string;
  declare createdAt: CreationOptional<Date>;
}
BriefingRevision.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    briefingId: { type: DataTypes.UUID, allowNull: false },
    number: { type: DataTypes.INTEGER, allowNull: false },
    title: { type: DataTypes.TEXT, allowNull: false },
    objective: { type: DataTypes.TEXT, allowNull: false },
    elements: { type: DataTypes.JSONB, allowNull: false },
    equipment: { type: DataTypes.TEXT, allowNull: false },
    completionStandard: { type: DataTypes.TEXT, allowNull: false },
    syllabusRevisionId: { type: DataTypes.UUID, allowNull: false },
    changeNote: { type: DataTypes.TEXT, allowNull: false },
    createdBy: { type: DataTypes.UUID, allowNull: false },
    createdAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
  },
  { sequelize, tableName: "briefing_revisions" },
);

export class BriefingRevisionItem extends Model<InferAttributes<BriefingRevisionItem>, InferCreationAttributes<BriefingRevisionItem>> {
  declare briefingRevisionId: string;
  declare syllabusItemId: string;
}
BriefingRevisionItem.init(
  {
    briefingRevisionId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
    syllabusItemId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
  },
  { sequelize, tableName: "briefing_revision_items" },
);

export class BriefingRevisionDemo extends Model<InferAttributes<BriefingRevisionDemo>, InferCreationAttributes<BriefingRevisionDemo>> {
  declare briefingRevisionId: string;
  declare demoRevisionId: string;
  declare position: number;
}
BriefingRevisionDemo.init(
  {
    briefingRevisionId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
    demoRevisionId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
    position: { type: DataTypes.INTEGER, allowNull: false },
  },
  { sequelize, tableName: "briefing_revision_demos" },
);

export type HandoutContentType = "application/pdf" | "image/png" | "image/jpeg";

/** A handout file; its bytes live in PostgreSQL. Load `content` only when serving the file. */
export class Handout extends Model<InferAttributes<Handout>, InferCreationAttributes<Handout>> {
  declare id: CreationOptional<string>;
  declare schoolId: string;
  declare briefingId: string;
  declare fileName: string;
  declare contentType: HandoutContentType;
  declare byteSize: number;
  declare sha256: string;
  declare content: Buffer;
  declare uploadedBy: string;
  declare createdAt: CreationOptional<Date>;
}
Handout.init(
  {
    id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
    schoolId: { type: DataTypes.UUID, allowNull: false },
    briefingId: { type: DataTypes.UUID, allowNull: false },
    fileName: { type: DataTypes.TEXT, allowNull: false },
    contentType: { type: DataTypes.TEXT, allowNull: false },
    byteSize: { type: DataTypes.INTEGER, allowNull: false },
    sha256: { type: DataTypes.TEXT, allowNull: false },
    content: { type: DataTypes.BLOB, allowNull: false },
    uploadedBy: { type: DataTypes.UUID, allowNull: false },
    createdAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
  },
  { sequelize, tableName: "handouts" },
);

export class BriefingRevisionHandout extends Model<
  InferAttributes<BriefingRevisionHandout>,
  InferCreationAttributes<BriefingRevisionHandout>
> {
  declare briefingRevisionId: string;
  declare handoutId: string;
  declare position: number;
}
BriefingRevisionHandout.init(
  {
    briefingRevisionId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
    handoutId: { type: DataTypes.UUID, allowNull: false, primaryKey: true },
    position: { type: DataTypes.INTEGER, allowNull: false },
  },
  { sequelize, tableName: "briefing_revision_handouts" },
);
