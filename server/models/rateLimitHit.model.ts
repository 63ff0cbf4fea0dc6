import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/**
 * A hit counter of the rate limiter, shared by every API process through MariaDB
 * (see server/middleware/rateLimit.ts). `key` already carries the limiter's prefix.
 */
export class RateLimitHit extends Model<InferAttributes<RateLimitHit>, InferCreationAttributes<RateLimitHit>> {
  declare key: string;
  declare hits: number;
  declare resetAt: Date;
}

/** Binds the RateLimitHit model to a Sequelize instance. */
export function initRateLimitHitModel(sequelize: Sequelize): typeof RateLimitHit {
  RateLimitHit.init(
    {
      key: { type: DataTypes.STRING(191), primaryKey: true },
      hits: { type: DataTypes.INTEGER, allowNull: false },
      resetAt: { type: DataTypes.DATE(3), allowNull: false },
    },
    { sequelize, tableName: 'rate_limit_hits', modelName: 'RateLimitHit', timestamps: false },
  );
  return RateLimitHit;
}
