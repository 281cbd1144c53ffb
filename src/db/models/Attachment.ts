import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import {
  ATTACHMENT_KINDS,
  ATTACHMENT_SOURCES,
  MATCH_STATUSES,
  type AttachmentKind,
  type AttachmentSource,
  type MatchStatus,
} from '../../lib/attachments/file-types';

/**
 * A file kept with an exam: an uploaded PNG/JPEG or a DICOM object (uploaded, or later sent by a
 * scanner). The bytes live in the FileStore under `storageKey`, exactly as received.
 */
export class Attachment extends Model<InferAttributes<Attachment>, InferCreationAttributes<Attachment>> {
  declare id: CreationOptional<number>;
  /** Null only while an object from the network waits in the holding list. */
  declare examId: ForeignKey<number> | null;
  declare matchStatus: CreationOptional<MatchStatus>;
  declare kind: AttachmentKind;
  declare source: AttachmentSource;
  declare originalName: string;
  declare contentType: string;
  declare sizeBytes: number;
  /** Lower-case hex SHA-256 of the stored bytes. */
  declare sha256: string;
  declare storageKey: string;
  declare thumbnailKey: string | null;
  declare patientId: string | null;
  declare accessionNumber: string | null;
  declare studyInstanceUid: string | null;
  declare seriesInstanceUid: string | null;
  declare sopInstanceUid: string | null;
  declare sopClassUid: string | null;
  declare modality: string | null;
  /** UTC instant; from the file's acquisition (or content) date and time. */
  declare acquiredAt: Date | null;
  declare imageRows: number | null;
  declare imageColumns: number | null;
  declare frameCount: number | null;
  declare transferSyntaxUid: string | null;
  declare uploadedBy: ForeignKey<number> | null;
  /** The calling AE title of the scanner that sent it over the network; null for uploads. */
  declare receivedFrom: CreationOptional<string | null>;
  /** Why a network object waits in the holding list (no exam found, or the patient did not match). */
  declare heldReason: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): void {
    Attachment.init(
      {
        id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
        examId: { type: DataTypes.INTEGER, allowNull: true },
        matchStatus: { type: DataTypes.ENUM(...MATCH_STATUSES), allowNull: false, defaultValue: 'matched' },
        kind: { type: DataTypes.ENUM(...ATTACHMENT_KINDS), allowNull: false },
        source: { type: DataTypes.ENUM(...ATTACHMENT_SOURCES), allowNull: false },
        originalName: { type: DataTypes.STRING(255), allowNull: false },
        contentType: { type: DataTypes.STRING(100), allowNull: false },
        sizeBytes: { type: DataTypes.INTEGER, allowNull: false },
        sha256: { type: DataTypes.CHAR(64), allowNull: false },
        storageKey: { type: DataTypes.STRING(255), allowNull: false, unique: true },
        thumbnailKey: { type: DataTypes.STRING(255), allowNull: true },
        patientId: { type: DataTypes.STRING(64), allowNull: true },
        accessionNumber: { type: DataTypes.STRING(16), allowNull: true },
        studyInstanceUid: { type: DataTypes.STRING(64), allowNull: true },
        seriesInstanceUid: { type: DataTypes.STRING(64), allowNull: true },
        sopInstanceUid: { type: DataTypes.STRING(64), allowNull: true, unique: true },
        sopClassUid: { type: DataTypes.STRING(64), allowNull: true },
        modality: { type: DataTypes.STRING(16), allowNull: true },
        acquiredAt: { type: DataTypes.DATE, allowNull: true },
        imageRows: { type: DataTypes.INTEGER, allowNull: true },
        imageColumns: { type: DataTypes.INTEGER, allowNull: true },
        frameCount: { type: DataTypes.INTEGER, allowNull: true },
        transferSyntaxUid: { type: DataTypes.STRING(64), allowNull: true },
        uploadedBy: { type: DataTypes.INTEGER, allowNull: true },
        receivedFrom: { type: DataTypes.STRING(16), allowNull: true },
        heldReason: { type: DataTypes.STRING(255), allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'attachments', modelName: 'Attachment' },
    );
  }
}
