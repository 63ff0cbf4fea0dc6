import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/**
 * Delivery states of a queued mail: waiting (also between retries), delivered, given up after the last attempt, or
 * discarded (built at sending time and found to have nobody to go to: a reset asked for an unknown address).
 */
export const NOTIFICATION_STATUSES = ['pending', 'sent', 'failed', 'discarded'] as const;
export type NotificationStatus = (typeof NOTIFICATION_STATUSES)[number];

/**
 * One e-mail notice in the mail queue (table `mail_queue`): written in the transaction of the change it
 * announces, sent after the commit, retried with backoff until `sent` or `failed`.
 */
export class Notification extends Model<InferAttributes<Notification>, InferCreationAttributes<Notification>> {
  declare id: CreationOptional<number>;
  /** What it announces, e.g. "revision.submitted". */
  declare kind: string;
  declare toAddress: string;
  declare subject: string;
  declare textBody: string;
  declare htmlBody: string;
  declare status: CreationOptional<NotificationStatus>;
  declare attempts: CreationOptional<number>;
  declare lastError: string | null;
  declare nextAttemptAt: Date;
  declare lockedUntil: Date | null;
  /** The random token of the sender holding the row (with `lockedUntil` as its lease), or null. */
  declare claimToken: CreationOptional<string | null>;
  declare sentAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** Binds the Notification model to a Sequelize instance. */
export function initNotificationModel(sequelize: Sequelize): typeof Notification {
  Notification.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      kind: { type: DataTypes.STRING(48), allowNull: false },
      toAddress: { type: DataTypes.STRING(254), allowNull: false },
      subject: { type: DataTypes.STRING(300), allowNull: false },
      textBody: { type: DataTypes.TEXT('long'), allowNull: false },
      htmlBody: { type: DataTypes.TEXT('long'), allowNull: false },
      status: { type: DataTypes.STRING(16), allowNull: false, defaultValue: 'pending' },
      attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      lastError: { type: DataTypes.TEXT, allowNull: true },
      nextAttemptAt: { type: DataTypes.DATE(3), allowNull: false },
      lockedUntil: { type: DataTypes.DATE(3), allowNull: true },
      claimToken: { type: DataTypes.CHAR(32), allowNull: true },
      sentAt: { type: DataTypes.DATE(3), allowNull: true },
      createdAt: DataTypes.DATE(3),
      updatedAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'mail_queue', modelName: 'Notification' },
  );
  return Notification;
}
