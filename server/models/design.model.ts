import type { Mechanism } from '@/engine';
import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { User } from './user.model';

import type { DesignResultSummary, DesignStatus } from '@/contracts';

export type { DesignStatus };

/** The mechanisms a design can be (the engine's MECHANISMS: one declaration). */
export type DesignMechanism = Mechanism;

/**
 * A design being worked on: its current inputs (a validated design document, defaults filled in),
 * status and owner. `version` is the optimistic lock: every save bumps it, and a save that names an
 * older version is refused (409) instead of overwriting someone else's change.
 */
export class Design extends Model<InferAttributes<Design>, InferCreationAttributes<Design>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare mechanism: DesignMechanism;
  declare status: CreationOptional<DesignStatus>;
  declare ownerId: ForeignKey<User['id']>;
  /** The owner's name, kept here so the Designs list sorts by owner with an index (filled by the model). */
  declare ownerName: CreationOptional<string>;
  declare updatedById: ForeignKey<User['id']> | null;
  declare inputs: Record<string, unknown>;
  declare travelXMm: number;
  declare travelYMm: number;
  declare resultSummary: DesignResultSummary | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** Binds the Design model to a Sequelize instance. */
export function initDesignModel(sequelize: Sequelize): typeof Design {
  Design.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      name: { type: DataTypes.STRING(200), allowNull: false },
      mechanism: { type: DataTypes.STRING(16), allowNull: false },
      status: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'draft' },
      ownerName: { type: DataTypes.STRING(200), allowNull: false, defaultValue: '' },
      inputs: { type: DataTypes.JSON, allowNull: false },
      travelXMm: { type: DataTypes.DOUBLE, allowNull: false },
      travelYMm: { type: DataTypes.DOUBLE, allowNull: false },
      resultSummary: { type: DataTypes.JSON, allowNull: true },
      version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    {
      sequelize,
      tableName: 'designs',
      modelName: 'Design',
      hooks: {
        // owner_name follows owner_id wherever a design is created or changes hands (users.service renames).
        async beforeCreate(design, options) {
          await fillOwnerNames([design], options.transaction);
        },
        async beforeBulkCreate(designs, options) {
          await fillOwnerNames(designs, options.transaction);
        },
        async beforeUpdate(design, options) {
          if (design.changed('ownerId')) await fillOwnerNames([design], options.transaction, true);
        },
      },
    },
  );
  return Design;
}

/** Sets ownerName from the users table on designs that lack it (or all of them, when the owner changed). */
async function fillOwnerNames(designs: Design[], transaction: unknown, always = false): Promise<void> {
  const need = designs.filter((d) => d.ownerId !== undefined && d.ownerId !== null && (always || !d.ownerName));
  if (!need.length) return;
  const ids = [...new Set(need.map((d) => d.ownerId))];
  const [rows] = (await Design.sequelize!.query('SELECT id, name FROM users WHERE id IN (:ids)', {
    replacements: { ids },
    transaction: transaction as never,
  })) as [{ id: number; name: string }[], unknown];
  const names = new Map(rows.map((r) => [r.id, r.name]));
  for (const d of need) d.ownerName = names.get(d.ownerId) ?? '';
}
