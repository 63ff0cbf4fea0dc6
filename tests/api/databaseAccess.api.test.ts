import { createHash } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app';
import { getConfig } from '../../server/config';
import { closeSequelize, getSequelize } from '../../server/db';
import { AuditLog, Sheet } from '../../server/models';
import { createApprovedSheet, createUser, signedInAs, type Agent } from '../helpers/factories';

/**
 * The application's database account may only read and write rows (issue 12, item 7): it cannot drop the trigger
 * that freezes published sheets, swap a sheet's bytes with REPLACE, delete a sheet, or change the schema; and a sheet
 * whose bytes no longer match their recorded SHA-256 is never served.
 */
const app = createApp();
let maker: Agent;
let sheetId: number;
let owner: Awaited<ReturnType<typeof createUser>>;

type SheetRow = Record<string, unknown> & { id: number; a4_pdf: Buffer; a4_sha256: string };
const readSheetRow = async (id: number) =>
  (await getSequelize().query<SheetRow>('SELECT * FROM sheets WHERE id = ?', { replacements: [id], type: QueryTypes.SELECT }))[0];

/** The error MariaDB raised for a statement, or null when it went through. */
async function refusal(sql: string, replacements: unknown[] = []): Promise<string | null> {
  try {
    await getSequelize().query(sql, { replacements });
    return null;
  } catch (err) {
    return (err as Error).message;
  }
}

beforeAll(async () => {
  owner = await createUser({ roles: ['designer'] });
  const approver = await createUser({ roles: ['reviewer'] });
  ({ sheetId } = await createApprovedSheet({ owner: owner.user, approver: approver.user }));
  ({ agent: maker } = await signedInAs(app, ['maker']));
});
afterAll(() => closeSequelize());

describe("the application's database account", () => {
  // fix: #12 — the account had GRANT ALL.
  it('when its grants are listed, then it holds SELECT, INSERT, UPDATE and DELETE on its database and nothing else', async () => {
    // Act
    const rows = await getSequelize().query<Record<string, string>>('SHOW GRANTS FOR CURRENT_USER()', { type: QueryTypes.SELECT });
    // Assert
    const grants = rows.map((r) => Object.values(r)[0]);
    const database = getConfig().db.name;
    // (The test account serves the e2e database too, with the same rights.)
    const [usage, ...onDatabases] = grants;
    expect(usage).toMatch(/^GRANT USAGE ON \*\.\* TO/);
    for (const grant of onDatabases) expect(grant).toMatch(/^GRANT SELECT, INSERT, UPDATE, DELETE ON `gw_test_\w+`\.\* TO [^ ]+$/);
    expect(onDatabases.some((g) => g.includes(`\`${database}\``))).toBe(true);
  });

  it.each([
    ['DROP TRIGGER sheets_frozen', 'DROP TRIGGER sheets_frozen'],
    ['DROP TRIGGER sheets_undeletable', 'DROP TRIGGER sheets_undeletable'],
    ['CREATE TABLE', 'CREATE TABLE gw_probe (id INT)'],
    ['ALTER TABLE', 'ALTER TABLE sheets ADD COLUMN probe INT'],
    ['DROP TABLE', 'DROP TABLE audit_log'],
    ['GRANT', `GRANT ALL PRIVILEGES ON \`${process.env.DB_NAME}\`.* TO CURRENT_USER()`],
  ])('when it tries %s, then MariaDB refuses', async (_label, sql) => {
    expect(await refusal(sql)).toMatch(/denied|Access/i);
  });
});

describe('published sheets stay as approved', () => {
  // fix: #12 — REPLACE INTO sheets swapped an approved PDF's bytes.
  it('when the account REPLACEs a sheet row with other bytes, then the trigger refuses and the bytes stay', async () => {
    // Arrange
    const before = await readSheetRow(sheetId);
    const columns = Object.keys(before);
    const forged = { ...before, a4_pdf: Buffer.from('%PDF-1.4 forged') };
    // Act
    const error = await refusal(
      `REPLACE INTO sheets (${columns.map((c) => `\`${c}\``).join(', ')}) VALUES (${columns.map(() => '?').join(', ')})`,
      columns.map((c) => forged[c]),
    );
    // Assert
    expect(error).toMatch(/A design sheet never changes once published/);
    const after = await readSheetRow(sheetId);
    expect(Buffer.compare(after.a4_pdf, before.a4_pdf)).toBe(0);
  });

  it('when the account DELETEs or UPDATEs a sheet, then the trigger refuses and the row stays', async () => {
    expect(await refusal('DELETE FROM sheets WHERE id = ?', [sheetId])).toMatch(/never changes once published/);
    expect(await refusal("UPDATE sheets SET comment = 'forged' WHERE id = ?", [sheetId])).toMatch(/never changes once published/);
    expect(await Sheet.count({ where: { id: sheetId } })).toBe(1);
  });

  // fix: #12 — the PDF was served without checking it against its recorded SHA-256.
  it('when the stored bytes do not match the recorded SHA-256, then the PDF is not served: 500 and an audit entry', async () => {
    // Arrange: a sheet whose recorded hash belongs to other bytes, as if its bytes had been swapped behind the trigger.
    const approver = await createUser({ roles: ['reviewer'] });
    const wrongHash = createHash('sha256').update('other bytes').digest('hex');
    const { sheetId: tamperedId } = await createApprovedSheet({ owner: owner.user, approver: approver.user, recordedA4Sha256: wrongHash });
    const tampered = { id: tamperedId };
    // Act
    const res = await maker.get(`/api/sheets/${tampered.id}/pdf`);
    const good = await maker.get(`/api/sheets/${sheetId}/pdf`);
    // Assert
    expect(res.status).toBe(500);
    expect(res.headers['content-type']).toMatch(/application\/json/);
    expect(res.body.error.code).toBe('sheet_integrity_failed');
    expect(res.body).not.toHaveProperty('a4Pdf');
    const audit = await AuditLog.findOne({ where: { action: 'sheet.integrity_failed', entityId: tampered.id } });
    expect(audit?.reason).toContain(wrongHash);
    expect(good.status).toBe(200);
  });
});
