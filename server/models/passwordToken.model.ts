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

export const TOKEN_PURPOSES = ['reset', 'invite'] as const;
export type TokenPurpose = (typeof TOKEN_PURPOSES)[number];

/**
 * A one-time set-password token. Only the SHA-256 of the token is stored, so a database leak
 * does not hand out working links.
 */
export class PasswordToken extends Model<InferAttributes<PasswordToken>, InferCreationAttributes<PasswordToken>> {
  declare id: CreationOptional<number>;
  declare userId: ForeignKey<User['id']>;
  declare tokenHash: string;
  declare purpose: TokenPurpose;
  declare expiresAt: Date;
  declare usedAt: Date | null;
  declare createdAt: CreationOptional<Date>;
}

/** Binds the PasswordToken model to a Sequelize instance. */
export function initPasswordTokenModel(sequelize: Sequelize): typeof PasswordToken {
  PasswordToken.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      purpose: { type: DataTypes.ENUM(...TOKEN_PURPOSES), allowNull: false },
      expiresAt: { type: DataTypes.DATE(3), allowNull: false },
      usedAt: { type: DataTypes.DATE(3), allowNull: true },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'password_tokens', modelName: 'PasswordToken', updatedAt: false },
  );
  return PasswordToken;
}
