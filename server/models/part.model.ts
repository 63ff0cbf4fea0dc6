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

import type { PartKind } from '@/contracts';

export type { PartKind };

/**
 * One entry of the shared parts shelf (a belt, pulley or motor). The kind-specific numbers live in
 * `data`, shaped like the matching design sub-object so picking a part fills the Design desk form.
 * A retired part is hidden from pickers but stays readable by id.
 */
export class Part extends Model<InferAttributes<Part>, InferCreationAttributes<Part>> {
  declare id: CreationOptional<number>;
  declare kind: PartKind;
  declare name: string;
  declare data: Record<string, unknown>;
  declare note: CreationOptional<string>;
  declare retired: CreationOptional<boolean>;
  declare createdById: ForeignKey<User['id']> | null;
  declare updatedById: ForeignKey<User['id']> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** Binds the Part model to a Sequelize instance. */
export function initPartModel(sequelize: Sequelize): typeof Part {
  Part.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      kind: { type: DataTypes.STRING(16), allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      data: { type: DataTypes.JSON, allowNull: false },
      note: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      retired: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'parts', modelName: 'Part' },
  );
  return Part;
}
