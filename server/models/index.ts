import type { Sequelize } from 'sequelize';
import { initUserModel, User } from './user.model';
import { initPasswordTokenModel, PasswordToken } from './passwordToken.model';
import { initAuditLogModel, AuditLog } from './auditLog.model';
import { initDesignModel, Design } from './design.model';
import { initPartModel, Part } from './part.model';
import { initRevisionModel, Revision } from './revision.model';
import { initRevisionCommentModel, RevisionComment } from './comment.model';
import { initSheetModel, Sheet } from './sheet.model';
import { initNotificationModel } from './notification.model';
import { initAttachmentModel, Attachment } from './attachment.model';
import { initMeasurementModel, Measurement } from './measurement.model';
import { initSessionModel, Session } from './session.model';

export { User, ROLES, type Role } from './user.model';
export { PasswordToken, type TokenPurpose } from './passwordToken.model';
export { AuditLog } from './auditLog.model';
export { Design, type DesignStatus, type DesignMechanism } from './design.model';
export { Part, type PartKind } from './part.model';
export { Revision, type RevisionStatus } from './revision.model';
export { RevisionComment } from './comment.model';
export { Sheet, type SheetPaper } from './sheet.model';
export { Notification } from './notification.model';
export { Attachment, type AttachmentMime } from './attachment.model';
export { Measurement, type MeasurementSource, type StoredSpectrum } from './measurement.model';
export { Session, type SessionRevokeReason } from './session.model';

/**
 * Initialises every model on `sequelize`, then wires all associations in this one block.
 * Later features add their `initXModel(sequelize)` line and their associations here.
 */
export function initModels(sequelize: Sequelize): void {
  initUserModel(sequelize);
  initPasswordTokenModel(sequelize);
  initAuditLogModel(sequelize);
  initDesignModel(sequelize);
  initPartModel(sequelize);
  initRevisionModel(sequelize);
  initRevisionCommentModel(sequelize);
  initSheetModel(sequelize);
  initNotificationModel(sequelize);
  initAttachmentModel(sequelize);
  initMeasurementModel(sequelize);
  initSessionModel(sequelize);

  // Associations (one place).
  User.hasMany(PasswordToken, { foreignKey: 'userId', as: 'passwordTokens', onDelete: 'CASCADE' });
  PasswordToken.belongsTo(User, { foreignKey: 'userId', as: 'user' });
  User.hasMany(AuditLog, { foreignKey: 'actorId', as: 'auditEntries' });
  AuditLog.belongsTo(User, { foreignKey: 'actorId', as: 'actor' });
  User.hasMany(Design, { foreignKey: 'ownerId', as: 'designs' });
  Design.belongsTo(User, { foreignKey: 'ownerId', as: 'owner' });
  Design.belongsTo(User, { foreignKey: 'updatedById', as: 'updatedBy' });
  Part.belongsTo(User, { foreignKey: 'createdById', as: 'createdBy' });
  Part.belongsTo(User, { foreignKey: 'updatedById', as: 'updatedBy' });
  Design.hasMany(Revision, { foreignKey: 'designId', as: 'revisions', onDelete: 'CASCADE' });
  Revision.belongsTo(Design, { foreignKey: 'designId', as: 'design' });
  Revision.belongsTo(User, { foreignKey: 'authorId', as: 'author' });
  Revision.belongsTo(User, { foreignKey: 'decidedById', as: 'decidedBy' });
  Revision.hasMany(RevisionComment, { foreignKey: 'revisionId', as: 'comments', onDelete: 'CASCADE' });
  RevisionComment.belongsTo(Revision, { foreignKey: 'revisionId', as: 'revision' });
  RevisionComment.belongsTo(User, { foreignKey: 'authorId', as: 'author' });
  Revision.hasOne(Sheet, { foreignKey: 'revisionId', as: 'sheet' });
  Sheet.belongsTo(Revision, { foreignKey: 'revisionId', as: 'revision' });
  Sheet.belongsTo(Design, { foreignKey: 'designId', as: 'design' });
  Sheet.belongsTo(User, { foreignKey: 'approvedById', as: 'approvedBy' });
  Design.hasMany(Attachment, { foreignKey: 'designId', as: 'attachments', onDelete: 'CASCADE' });
  Attachment.belongsTo(Design, { foreignKey: 'designId', as: 'design' });
  Attachment.belongsTo(Part, { foreignKey: 'partId', as: 'part' });
  Attachment.belongsTo(User, { foreignKey: 'uploadedById', as: 'uploadedBy' });
  Sheet.hasMany(Measurement, { foreignKey: 'sheetId', as: 'measurements' });
  Measurement.belongsTo(Sheet, { foreignKey: 'sheetId', as: 'sheet' });
  Measurement.belongsTo(User, { foreignKey: 'measuredById', as: 'measuredBy' });
  User.hasMany(Session, { foreignKey: 'userId', as: 'sessions', onDelete: 'CASCADE' });
  Session.belongsTo(User, { foreignKey: 'userId', as: 'user' });
}
