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
import type { Revision } from './revision.model';
import type { User } from './user.model';

import type { SheetPaper } from '@/contracts';

export type { SheetPaper };

/**
 * The design sheet of an approved revision: the PDF in both paper sizes (bytes in the content store, named by their
 * SHA-256; older rows keep them in the row), and the
 * approval printed on it. Written once at approval and never changed (a database trigger refuses updates).
 */
export class Sheet extends Model<InferAttributes<Sheet>, InferCreationAttributes<Sheet>> {
  declare id: CreationOptional<number>;
  declare revisionId: ForeignKey<Revision['id']>;
  declare designId: ForeignKey<Design['id']>;
  declare approvedById: ForeignKey<User['id']>;
  declare approvedAt: Date;
  declare comment: string;
  /** The A4 PDF of a sheet published before sheets moved to the content store; null: the bytes are in the store under a4Sha256. */
  declare a4Pdf: Buffer | null;
  declare a4Sha256: string;
  declare a4Size: number;
  /** As a4Pdf, for US Letter. */
  declare letterPdf: Buffer | null;
  declare letterSha256: string;
  declare letterSize: number;
  declare createdAt: CreationOptional<Date>;
}

/** Binds the Sheet model to a Sequelize instance. */
export function initSheetModel(sequelize: Sequelize): typeof Sheet {
  Sheet.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      approvedAt: { type: DataTypes.DATE(3), allowNull: false },
      comment: { type: DataTypes.TEXT, allowNull: false },
      a4Pdf: { type: DataTypes.BLOB('long'), allowNull: true, field: 'a4_pdf' },
      a4Sha256: { type: DataTypes.CHAR(64), allowNull: false, field: 'a4_sha256' },
      a4Size: { type: DataTypes.INTEGER, allowNull: false, field: 'a4_size' },
      letterPdf: { type: DataTypes.BLOB('long'), allowNull: true },
      letterSha256: { type: DataTypes.CHAR(64), allowNull: false, field: 'letter_sha256' },
      letterSize: { type: DataTypes.INTEGER, allowNull: false },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'sheets', modelName: 'Sheet', updatedAt: false },
  );
  return Sheet;
}
