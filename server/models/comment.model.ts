import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { Revision } from './revision.model';
import type { User } from './user.model';

/** One comment in the threaded discussion of a revision; `parentId` is the comment it answers. Never edited. */
export class RevisionComment extends Model<InferAttributes<RevisionComment>, InferCreationAttributes<RevisionComment>> {
  declare id: CreationOptional<number>;
  declare revisionId: ForeignKey<Revision['id']>;
  declare parentId: number | null;
  declare authorId: ForeignKey<User['id']>;
  declare body: string;
  declare createdAt: CreationOptional<Date>;
}

/** Binds the RevisionComment model to a Sequelize instance. */
export function initRevisionCommentModel(sequelize: Sequelize): typeof RevisionComment {
  RevisionComment.init(
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
      parentId: { type: DataTypes.INTEGER, allowNull: true },
      body: { type: DataTypes.TEXT, allowNull: false },
      createdAt: DataTypes.DATE(3),
    },
    { sequelize, tableName: 'revision_comments', modelName: 'RevisionComment', updatedAt: false },
  );
  return RevisionComment;
}
