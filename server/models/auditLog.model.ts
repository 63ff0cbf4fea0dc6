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

/** One recorded action: who did what to which entity, the state change and the reason. Append-only. */
export class AuditLog extends Model<InferAttributes<AuditLog>, InferCreationAttributes<AuditLog>> {
  declare id: CreationOptional<number>;
  declare actorId: ForeignKey<User['id']> | null;
  declare action: string;
  declare entity: string;
  declare entityId: number | null;
  declare fromState: string | null;
  declare toState: string | null;
  declare reason: string | null;
  declare createdAt: CreationOptional<Date>;
}

/** Binds the AuditLog model to a Sequelize instance. */
export function initAuditLogModel(sequelize: Sequelize): typeof AuditLog {
  AuditLog.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      action: { type: DataTypes.STRING(64), allowNull: false },
      entity: { type: DataTypes.STRING(64), allowNull: false },
      entityId: { type: DataTypes.INTEGER, allowNull: true },
      fromState: { type: DataTypes.STRING(64), allowNull: true },
      toState: { type: DataTypes.STRING(64), allowNull: true },
      reason: { type: DataTypes.TEXT, allowNull: true },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'audit_log', modelName: 'AuditLog', updatedAt: false },
  );
  return AuditLog;
}
