import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { UnitSystem } from '@/format';
import type { Design } from './design.model';
import type { User } from './user.model';

import type { RevisionStatus, RevisionSummaryFigures } from '@/contracts';

export type { RevisionStatus };

/**
 * A submitted design, frozen: the design document, the full engine result, the engine version and the
 * fingerprint (SHA-256 of both) never change after the insert (a database trigger refuses it). Only the review
 * state moves on: who decided, when, and the return reason or approval comment (`decisionNote`).
 */
export class Revision extends Model<InferAttributes<Revision>, InferCreationAttributes<Revision>> {
  declare id: CreationOptional<number>;
  declare designId: ForeignKey<Design['id']>;
  /** 1, 2, … per design. */
  declare number: number;
  declare status: RevisionStatus;
  declare inputs: Record<string, unknown>;
  declare result: Record<string, unknown>;
  /** A few figures of `result` for lists (frozen with it). */
  declare summary: RevisionSummaryFigures;
  declare engineVersion: string;
  declare fingerprint: string;
  declare authorId: ForeignKey<User['id']>;
  declare submittedAt: Date;
  declare decidedById: ForeignKey<User['id']> | null;
  declare decidedAt: Date | null;
  declare decisionNote: string | null;
  /** Why the reviewer approved although a check failed (null otherwise). */
  declare approvalJustification: CreationOptional<string | null>;
  /** Unit system the design sheet is printed in, chosen by the designer at submission. */
  declare sheetUnits: CreationOptional<UnitSystem>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** Binds the Revision model to a Sequelize instance. */
export function initRevisionModel(sequelize: Sequelize): typeof Revision {
  Revision.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      number: { type: DataTypes.INTEGER, allowNull: false },
      status: { type: DataTypes.STRING(16), allowNull: false },
      inputs: { type: DataTypes.JSON, allowNull: false },
      result: { type: DataTypes.JSON, allowNull: false },
      summary: { type: DataTypes.JSON, allowNull: false },
      engineVersion: { type: DataTypes.STRING(32), allowNull: false },
      fingerprint: { type: DataTypes.CHAR(64), allowNull: false },
      submittedAt: { type: DataTypes.DATE(3), allowNull: false },
      decidedAt: { type: DataTypes.DATE(3), allowNull: true },
      decisionNote: { type: DataTypes.TEXT, allowNull: true },
      approvalJustification: { type: DataTypes.TEXT, allowNull: true, defaultValue: null },
      sheetUnits: { type: DataTypes.STRING(8), allowNull: false, defaultValue: 'metric' },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'revisions', modelName: 'Revision' },
  );
  return Revision;
}
