import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { Design } from './design.model';
import type { Part } from './part.model';
import type { User } from './user.model';

/** Content types an attachment may have (found from its bytes, never from its name). */
export const ATTACHMENT_MIMES = ['application/pdf', 'image/png', 'image/jpeg', 'text/csv'] as const;
export type AttachmentMime = (typeof ATTACHMENT_MIMES)[number];

/**
 * An uploaded file: metadata here, bytes in the content-addressed store under UPLOAD_DIR (named by `sha256`).
 * It belongs to a design (datasheets, photos, CSV) or to a shelf motor (the source file of its torque table):
 * exactly one of `designId` / `partId` is set (database triggers enforce it).
 */
export class Attachment extends Model<InferAttributes<Attachment>, InferCreationAttributes<Attachment>> {
  declare id: CreationOptional<number>;
  declare designId: ForeignKey<Design['id']> | null;
  declare partId: ForeignKey<Part['id']> | null;
  declare uploadedById: ForeignKey<User['id']> | null;
  /** Sanitised file name (no path, no control characters), used in Content-Disposition. */
  declare fileName: string;
  /** Content type sniffed from the bytes. */
  declare mime: string;
  /** Size [bytes]. */
  declare size: number;
  /** Lower-case hex SHA-256 of the bytes: their only address in the store. */
  declare sha256: string;
  declare createdAt: CreationOptional<Date>;
}

/** Binds the Attachment model to a Sequelize instance. */
export function initAttachmentModel(sequelize: Sequelize): typeof Attachment {
  Attachment.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      fileName: { type: DataTypes.STRING(200), allowNull: false },
      mime: { type: DataTypes.STRING(40), allowNull: false },
      size: { type: DataTypes.INTEGER, allowNull: false },
      sha256: { type: DataTypes.CHAR(64), allowNull: false, field: 'sha256' },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'attachments', modelName: 'Attachment', updatedAt: false },
  );
  return Attachment;
}
