import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type CreationOptional, type Sequelize } from 'sequelize';
import type { Role } from '@shared/schemas/auth.schema';
import type { UnitSystem } from '@shared/schemas/project.schema';

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare name: string;
  declare role: Role;
  declare passwordHash: string | null;
  declare disabled: CreationOptional<boolean>;
  /** Raised on a password change or reset; sessions holding an older value are signed out. */
  declare sessionEpoch: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** A review e-mail a person has turned off (migration 0015); no row: they get it. */
export class EmailOptOut extends Model<InferAttributes<EmailOptOut>, InferCreationAttributes<EmailOptOut>> {
  declare userId: number;
  declare kind: string;
  declare createdAt: CreationOptional<Date>;
}

/** One e-mailed password-reset link; only the token's SHA-256 is stored. */
export class PasswordReset extends Model<InferAttributes<PasswordReset>, InferCreationAttributes<PasswordReset>> {
  declare id: CreationOptional<number>;
  declare tokenHash: string;
  declare userId: number;
  declare requestedById: number | null;
  declare expiresAt: Date;
  declare usedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Invitation extends Model<InferAttributes<Invitation>, InferCreationAttributes<Invitation>> {
  declare id: CreationOptional<number>;
  declare tokenHash: string;
  declare userId: number;
  declare invitedById: number | null;
  declare expiresAt: Date;
  declare usedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class OutboxMessage extends Model<InferAttributes<OutboxMessage>, InferCreationAttributes<OutboxMessage>> {
  declare id: CreationOptional<number>;
  declare from: string;
  /** JSON array of addresses. */
  declare to: string;
  declare subject: string;
  declare text: string;
  declare raw: string;
  declare receivedAt: Date;
}

export class Firm extends Model<InferAttributes<Firm>, InferCreationAttributes<Firm>> {
  declare id: number;
  declare name: string;
  declare address: string;
  declare paperSize: 'A4' | 'Letter';
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** The firm's caps on reading a drawing (migration 0008); one row, id 1. */
export class ImportLimitsRecord extends Model<InferAttributes<ImportLimitsRecord>, InferCreationAttributes<ImportLimitsRecord>> {
  declare id: number;
  declare maxSegments: number;
  declare maxBlockDepth: number;
  declare timeLimitSeconds: number;
  declare updatedById: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Project extends Model<InferAttributes<Project>, InferCreationAttributes<Project>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare jobNumber: string;
  declare client: string;
  declare site: string;
  declare designBasis: string;
  declare unitSystem: UnitSystem;
  declare archived: CreationOptional<boolean>;
  declare createdById: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Truss extends Model<InferAttributes<Truss>, InferCreationAttributes<Truss>> {
  declare id: CreationOptional<number>;
  declare projectId: number;
  declare name: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class Drawing extends Model<InferAttributes<Drawing>, InferCreationAttributes<Drawing>> {
  declare id: CreationOptional<number>;
  declare trussId: number;
  declare version: number;
  declare originalName: string;
  declare storedName: string;
  declare size: number;
  declare sha256: string;
  declare status: 'imported' | 'failed';
  /** JSON texts. */
  declare options: string;
  declare layers: string;
  declare result: string | null;
  declare error: string | null;
  declare uploadedById: number | null;
  declare importedAt: Date;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export class TrussModelRecord extends Model<InferAttributes<TrussModelRecord>, InferCreationAttributes<TrussModelRecord>> {
  declare trussId: number;
  declare drawingId: number | null;
  /** JSON of the TrussModel. */
  declare model: string;
  declare takeoff: string | null;
  declare version: CreationOptional<number>;
  declare updatedById: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** A revision of a truss's calc sheet (review statuses, and what issuing fixed). */
export class SheetRevision extends Model<InferAttributes<SheetRevision>, InferCreationAttributes<SheetRevision>> {
  declare id: CreationOptional<number>;
  declare trussId: number;
  declare runId: number;
  declare number: number;
  declare status: 'draft' | 'in-check' | 'returned' | 'checked' | 'issued' | 'superseded';
  declare preparedById: number;
  declare checkedById: CreationOptional<number | null>;
  /** The checker the preparer chose on submitting (0017); null on drafts and on rows submitted before 0017. */
  declare checkerId: CreationOptional<number | null>;
  declare issuedById: CreationOptional<number | null>;
  declare preparedByName: CreationOptional<string | null>;
  declare checkedByName: CreationOptional<string | null>;
  declare issuedByName: CreationOptional<string | null>;
  declare submittedAt: CreationOptional<Date | null>;
  declare checkedAt: CreationOptional<Date | null>;
  declare issuedAt: CreationOptional<Date | null>;
  declare supersededAt: CreationOptional<Date | null>;
  declare supersededById: CreationOptional<number | null>;
  declare pdfStoredName: CreationOptional<string | null>;
  declare pdfSize: CreationOptional<number | null>;
  declare sha256: CreationOptional<string | null>;
  declare signedRecord: CreationOptional<string | null>;
  declare signature: CreationOptional<string | null>;
  declare keyFingerprint: CreationOptional<string | null>;
  /** Who made the last status change and why; the audit-log trigger copies them. */
  declare lastActorId: number | null;
  declare lastNote: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** A line of a sheet revision's audit log, written by a trigger; append-only. */
export class SheetRevisionEvent extends Model<InferAttributes<SheetRevisionEvent>, InferCreationAttributes<SheetRevisionEvent>> {
  declare id: CreationOptional<number>;
  declare revisionId: number;
  declare fromStatus: string | null;
  declare toStatus: string;
  declare actorId: number | null;
  declare note: string;
  declare at: Date;
  /** The hash chain (0007): the previous line's hash and this line's, filled in by the records service. */
  declare prevHash: CreationOptional<string | null>;
  declare hash: CreationOptional<string | null>;
}

/** A public key the firm has signed issued records with; the current one has no retiredAt. */
export class SigningKey extends Model<InferAttributes<SigningKey>, InferCreationAttributes<SigningKey>> {
  /** First 16 hex digits of the SHA-256 of the SPKI DER. */
  declare keyId: string;
  /** The whole SHA-256 (hex) of the SPKI DER, as issued rows store it in keyFingerprint. */
  declare fingerprint: string;
  declare algorithm: string;
  declare publicKeyPem: string;
  declare createdAt: Date;
  declare retiredAt: CreationOptional<Date | null>;
}

/** A comment on a step of a sheet revision; a thread's replies point at its first comment. */
export class SheetComment extends Model<InferAttributes<SheetComment>, InferCreationAttributes<SheetComment>> {
  declare id: CreationOptional<number>;
  declare revisionId: number;
  declare trussId: number;
  declare parentId: number | null;
  declare anchor: string;
  declare body: string;
  declare authorId: number;
  declare resolvedById: CreationOptional<number | null>;
  declare resolvedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

const timestamps = { createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE };

/** Binds the models to a connection. Tables come from the migrations, never from sync(). */
export function initModels(sequelize: Sequelize): void {
  User.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      role: { type: DataTypes.STRING(16), allowNull: false },
      passwordHash: { type: DataTypes.STRING(100), allowNull: true },
      disabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      sessionEpoch: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      ...timestamps,
    },
    { sequelize, tableName: 'users' },
  );
  EmailOptOut.init(
    {
      userId: { type: DataTypes.INTEGER, primaryKey: true, allowNull: false },
      kind: { type: DataTypes.STRING(32), primaryKey: true, allowNull: false },
      createdAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'email_opt_outs', updatedAt: false },
  );
  PasswordReset.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      tokenHash: { type: DataTypes.STRING(64), allowNull: false },
      userId: { type: DataTypes.INTEGER, allowNull: false },
      requestedById: { type: DataTypes.INTEGER, allowNull: true },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      usedAt: { type: DataTypes.DATE, allowNull: true },
      ...timestamps,
    },
    { sequelize, tableName: 'password_resets' },
  );
  Invitation.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      tokenHash: { type: DataTypes.STRING(64), allowNull: false },
      userId: { type: DataTypes.INTEGER, allowNull: false },
      invitedById: { type: DataTypes.INTEGER, allowNull: true },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      usedAt: { type: DataTypes.DATE, allowNull: true },
      ...timestamps,
    },
    { sequelize, tableName: 'invitations' },
  );
  OutboxMessage.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      from: { type: DataTypes.STRING(320), allowNull: false },
      to: { type: DataTypes.TEXT, allowNull: false },
      subject: { type: DataTypes.STRING(400), allowNull: false },
      text: { type: DataTypes.TEXT, allowNull: false },
      raw: { type: DataTypes.TEXT, allowNull: false },
      receivedAt: { type: DataTypes.DATE, allowNull: false },
    },
    { sequelize, tableName: 'outbox_messages', timestamps: false },
  );
  Firm.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true },
      name: { type: DataTypes.STRING(160), allowNull: false },
      address: { type: DataTypes.STRING(400), allowNull: false },
      paperSize: { type: DataTypes.STRING(8), allowNull: false },
      ...timestamps,
    },
    { sequelize, tableName: 'firms' },
  );
  Project.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      name: { type: DataTypes.STRING(160), allowNull: false },
      jobNumber: { type: DataTypes.STRING(40), allowNull: false },
      client: { type: DataTypes.STRING(160), allowNull: false },
      site: { type: DataTypes.STRING(240), allowNull: false },
      designBasis: { type: DataTypes.TEXT, allowNull: false },
      unitSystem: { type: DataTypes.STRING(2), allowNull: false },
      archived: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      createdById: { type: DataTypes.INTEGER, allowNull: true },
      ...timestamps,
    },
    { sequelize, tableName: 'projects' },
  );
  Truss.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      projectId: { type: DataTypes.INTEGER, allowNull: false },
      name: { type: DataTypes.STRING(160), allowNull: false },
      ...timestamps,
    },
    { sequelize, tableName: 'trusses' },
  );
  Drawing.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      trussId: { type: DataTypes.INTEGER, allowNull: false },
      version: { type: DataTypes.INTEGER, allowNull: false },
      originalName: { type: DataTypes.STRING(255), allowNull: false },
      storedName: { type: DataTypes.STRING(80), allowNull: false },
      size: { type: DataTypes.INTEGER, allowNull: false },
      sha256: { type: DataTypes.STRING(64), allowNull: false },
      status: { type: DataTypes.STRING(16), allowNull: false },
      options: { type: DataTypes.TEXT, allowNull: false },
      layers: { type: DataTypes.TEXT, allowNull: false },
      result: { type: DataTypes.TEXT, allowNull: true },
      error: { type: DataTypes.TEXT, allowNull: true },
      uploadedById: { type: DataTypes.INTEGER, allowNull: true },
      importedAt: { type: DataTypes.DATE, allowNull: false },
      ...timestamps,
    },
    { sequelize, tableName: 'drawings' },
  );
  TrussModelRecord.init(
    {
      trussId: { type: DataTypes.INTEGER, primaryKey: true },
      drawingId: { type: DataTypes.INTEGER, allowNull: true },
      model: { type: DataTypes.TEXT, allowNull: false },
      takeoff: { type: DataTypes.TEXT, allowNull: true },
      version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      updatedById: { type: DataTypes.INTEGER, allowNull: true },
      ...timestamps,
    },
    { sequelize, tableName: 'truss_models' },
  );

  initSheetModels(sequelize);
  initRunModels(sequelize);
  initImportLimitsModel(sequelize);
}

function initSheetModels(sequelize: Sequelize): void {
  SheetRevision.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      trussId: { type: DataTypes.INTEGER, allowNull: false },
      runId: { type: DataTypes.INTEGER, allowNull: false },
      number: { type: DataTypes.INTEGER, allowNull: false },
      status: { type: DataTypes.STRING(16), allowNull: false },
      preparedById: { type: DataTypes.INTEGER, allowNull: false },
      checkedById: { type: DataTypes.INTEGER, allowNull: true },
      checkerId: { type: DataTypes.INTEGER, allowNull: true },
      issuedById: { type: DataTypes.INTEGER, allowNull: true },
      preparedByName: { type: DataTypes.STRING(120), allowNull: true },
      checkedByName: { type: DataTypes.STRING(120), allowNull: true },
      issuedByName: { type: DataTypes.STRING(120), allowNull: true },
      submittedAt: { type: DataTypes.DATE, allowNull: true },
      checkedAt: { type: DataTypes.DATE, allowNull: true },
      issuedAt: { type: DataTypes.DATE, allowNull: true },
      supersededAt: { type: DataTypes.DATE, allowNull: true },
      supersededById: { type: DataTypes.INTEGER, allowNull: true },
      pdfStoredName: { type: DataTypes.STRING(80), allowNull: true },
      pdfSize: { type: DataTypes.INTEGER, allowNull: true },
      sha256: { type: DataTypes.STRING(64), allowNull: true },
      signedRecord: { type: DataTypes.TEXT, allowNull: true },
      signature: { type: DataTypes.STRING(128), allowNull: true },
      keyFingerprint: { type: DataTypes.STRING(64), allowNull: true },
      lastActorId: { type: DataTypes.INTEGER, allowNull: true },
      lastNote: { type: DataTypes.TEXT, allowNull: true },
      ...timestamps,
    },
    { sequelize, tableName: 'sheet_revisions' },
  );
  SheetRevisionEvent.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      revisionId: { type: DataTypes.INTEGER, allowNull: false },
      fromStatus: { type: DataTypes.STRING(16), allowNull: true },
      toStatus: { type: DataTypes.STRING(16), allowNull: false },
      actorId: { type: DataTypes.INTEGER, allowNull: true },
      note: { type: DataTypes.TEXT, allowNull: false },
      at: { type: DataTypes.DATE, allowNull: false },
      prevHash: { type: DataTypes.STRING(64), allowNull: true },
      hash: { type: DataTypes.STRING(64), allowNull: true },
    },
    { sequelize, tableName: 'sheet_revision_events', timestamps: false },
  );
  SigningKey.init(
    {
      keyId: { type: DataTypes.STRING(16), primaryKey: true },
      fingerprint: { type: DataTypes.STRING(64), allowNull: false },
      algorithm: { type: DataTypes.STRING(16), allowNull: false },
      publicKeyPem: { type: DataTypes.TEXT, allowNull: false },
      createdAt: { type: DataTypes.DATE, allowNull: false },
      retiredAt: { type: DataTypes.DATE, allowNull: true },
    },
    { sequelize, tableName: 'signing_keys', timestamps: false },
  );
  SheetComment.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      revisionId: { type: DataTypes.INTEGER, allowNull: false },
      trussId: { type: DataTypes.INTEGER, allowNull: false },
      parentId: { type: DataTypes.INTEGER, allowNull: true },
      anchor: { type: DataTypes.STRING(200), allowNull: false },
      body: { type: DataTypes.TEXT, allowNull: false },
      authorId: { type: DataTypes.INTEGER, allowNull: false },
      resolvedById: { type: DataTypes.INTEGER, allowNull: true },
      resolvedAt: { type: DataTypes.DATE, allowNull: true },
      ...timestamps,
    },
    { sequelize, tableName: 'sheet_comments' },
  );
}

/** An analysis run: an immutable snapshot of a truss model and, once solved, its results. */
export class AnalysisRun extends Model<InferAttributes<AnalysisRun>, InferCreationAttributes<AnalysisRun>> {
  declare id: CreationOptional<number>;
  declare trussId: number;
  /** 1, 2, … within the truss (0014). */
  declare number: number;
  declare modelVersion: number;
  declare status: 'queued' | 'running' | 'solved' | 'unstable' | 'failed';
  /** JSON texts: RunProgress, TrussModel, { input, result } of the takeoff, TrussAnalysis, summary, error. */
  declare progress: string;
  declare model: string;
  declare takeoff: string | null;
  declare analysis: string | null;
  declare summary: string | null;
  declare error: string | null;
  declare ranById: number | null;
  declare startedAt: Date | null;
  declare finishedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

function initRunModels(sequelize: Sequelize): void {
  AnalysisRun.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      trussId: { type: DataTypes.INTEGER, allowNull: false },
      number: { type: DataTypes.INTEGER, allowNull: false },
      modelVersion: { type: DataTypes.INTEGER, allowNull: false },
      status: { type: DataTypes.STRING(16), allowNull: false },
      progress: { type: DataTypes.TEXT, allowNull: false },
      model: { type: DataTypes.TEXT, allowNull: false },
      takeoff: { type: DataTypes.TEXT, allowNull: true },
      analysis: { type: DataTypes.TEXT, allowNull: true },
      summary: { type: DataTypes.TEXT, allowNull: true },
      error: { type: DataTypes.TEXT, allowNull: true },
      ranById: { type: DataTypes.INTEGER, allowNull: true },
      startedAt: { type: DataTypes.DATE, allowNull: true },
      finishedAt: { type: DataTypes.DATE, allowNull: true },
      ...timestamps,
    },
    { sequelize, tableName: 'analysis_runs' },
  );
}

function initImportLimitsModel(sequelize: Sequelize): void {
  ImportLimitsRecord.init(
    {
      id: { type: DataTypes.INTEGER, primaryKey: true },
      maxSegments: { type: DataTypes.INTEGER, allowNull: false },
      maxBlockDepth: { type: DataTypes.INTEGER, allowNull: false },
      timeLimitSeconds: { type: DataTypes.INTEGER, allowNull: false },
      updatedById: { type: DataTypes.INTEGER, allowNull: true },
      createdAt: { type: DataTypes.DATE, allowNull: false },
      updatedAt: { type: DataTypes.DATE, allowNull: false },
    },
    { sequelize, tableName: 'import_limits' },
  );
}
