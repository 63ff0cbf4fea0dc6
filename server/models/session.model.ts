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

/** Why a session ended before its time. */
export const SESSION_REVOKE_REASONS = [
  'signed_out',
  'signed_out_elsewhere',
  'signed_out_everywhere',
  'password_changed',
  'disabled',
] as const;
export type SessionRevokeReason = (typeof SESSION_REVOKE_REASONS)[number];

/**
 * One sign-in (table `sessions`). The cookie's signed token carries a random session id; only its SHA-256 is stored
 * here, so a copy of the table cannot be turned into working cookies.
 */
export class Session extends Model<InferAttributes<Session>, InferCreationAttributes<Session>> {
  declare id: CreationOptional<number>;
  declare tokenHash: string;
  declare userId: ForeignKey<User['id']>;
  declare createdAt: CreationOptional<Date>;
  declare lastSeenAt: Date;
  declare expiresAt: Date;
  declare revokedAt: Date | null;
  declare revokedReason: SessionRevokeReason | null;
  /** "Firefox on Linux": a short summary of the browser's User-Agent, never the full string. */
  declare userAgent: string;
  declare ip: string;
}

/** Binds the Session model to a Sequelize instance. */
export function initSessionModel(sequelize: Sequelize): typeof Session {
  Session.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      createdAt: DataTypes.DATE(3),
      lastSeenAt: { type: DataTypes.DATE(3), allowNull: false },
      expiresAt: { type: DataTypes.DATE(3), allowNull: false },
      revokedAt: { type: DataTypes.DATE(3), allowNull: true },
      revokedReason: { type: DataTypes.STRING(32), allowNull: true },
      userAgent: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
      ip: { type: DataTypes.STRING(64), allowNull: false, defaultValue: '' },
    },
    { sequelize, tableName: 'sessions', modelName: 'Session', updatedAt: false },
  );
  return Session;
}
