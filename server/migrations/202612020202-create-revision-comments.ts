import { DataTypes, type QueryInterface } from 'sequelize';
import type { MigrationFn } from 'umzug';

// revision_comments: the threaded discussion of one revision. `parent_id` points at the comment answered
// (same revision). Comments are never edited; they go with their revision.
export const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.createTable(
    'revision_comments',
    {
      id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true, allowNull: false },
      revision_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        references: { model: 'revisions', key: 'id' },
        onDelete: 'CASCADE',
        onUpdate: 'CASCADE',
      },
      parent_id: {
        type: DataTypes.INTEGER,
        allowNull: true,
        references: { model: 'revision_comments', key: 'id' },
        onDelete: 'CASCADE',
        onUpdate: 'CASCADE',
      },
      author_id: {
        type: DataTypes.INTEGER,
        allowNull: false,
        references: { model: 'users', key: 'id' },
        onDelete: 'RESTRICT',
        onUpdate: 'CASCADE',
      },
      body: { type: DataTypes.TEXT, allowNull: false },
      created_at: { type: DataTypes.DATE(3), allowNull: false },
    },
    { charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci' },
  );
  await qi.addIndex('revision_comments', ['revision_id', 'created_at'], { name: 'revision_comments_revision' });
};

export const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.dropTable('revision_comments');
};
