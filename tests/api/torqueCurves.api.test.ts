import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { defaultDesign } from '@/engine';
import { createApp } from '../../server/app';
import { resetConfigCache } from '../../server/config';
import { closeSequelize } from '../../server/db';
import { Attachment, AuditLog, Part, type Role } from '../../server/models';
import { createPart, signedInAs, type Agent } from '../helpers/factories';

// Each test file stores uploads in its own folder, so counting files there is not disturbed by other files.
const UPLOAD_DIR = fs.mkdtempSync(path.join(os.tmpdir(), 'gw-torque-'));
process.env.UPLOAD_DIR = UPLOAD_DIR;
resetConfigCache();
const app = createApp();

type Who = 'admin' | 'designer' | 'reviewer' | 'maker' | 'anonymous';
const agents = {} as Record<Who, Agent>;

beforeAll(async () => {
  for (const who of ['admin', 'designer', 'reviewer', 'maker'] as const) agents[who] = (await signedInAs(app, [who as Role])).agent;
  agents.anonymous = request.agent(app);
});

afterAll(async () => {
  await closeSequelize();
  delete process.env.UPLOAD_DIR;
  resetConfigCache();
  fs.rmSync(UPLOAD_DIR, { recursive: true, force: true });
});

function storedFiles(): string[] {
  if (!fs.existsSync(UPLOAD_DIR)) return [];
  return (fs.readdirSync(UPLOAD_DIR, { recursive: true }) as string[])
    .map((p) => path.join(UPLOAD_DIR, p))
    .filter((p) => fs.statSync(p).isFile());
}

const newMotor = () => createPart('motor');
/** What the tables of these tests were measured at (the upload requires it). */
const MEASURED_AT = { supplyV: '24', currentRmsA: '1.5' };
const post = (
  who: Who,
  motorId: number,
  csv: string | Buffer,
  filename = 'curve.csv',
  contentType = 'text/csv',
  fields: Record<string, string> = MEASURED_AT,
) => {
  let req = agents[who].post(`/api/parts/motors/${motorId}/torque-curve`);
  for (const [name, value] of Object.entries(fields)) req = req.field(name, value);
  return req.attach('file', Buffer.isBuffer(csv) ? csv : Buffer.from(csv), { filename, contentType });
};

async function curveOf(motorId: number): Promise<unknown> {
  const row = await Part.findByPk(motorId);
  const data = (typeof row!.data === 'string' ? JSON.parse(row!.data) : row!.data) as { torqueCurve: unknown };
  return data.torqueCurve;
}

describe('POST /api/parts/motors/:id/torque-curve', () => {
  it('when an admin uploads rpm and N·cm, then 200 with the points in rev/s and N·m on the motor, and the file kept as its source', async () => {
    // Arrange
    const motor = await newMotor();
    const csv = 'speed_rpm,torque_Ncm\n0,40\n60,38\n300,30\n600,21\n';
    // Act
    const res = await post('admin', motor.id, csv, 'pull-out.csv');
    const shelf = await agents.designer.get(`/api/parts/motors/${motor.id}`);
    const info = await agents.maker.get(`/api/parts/motors/${motor.id}/torque-curve`);
    // Assert: 60 rpm = 1 rev/s; 1 N·cm = 0.01 N·m (exact SI prefixes).
    const expected = [
      { speedRevPerS: 0, torqueNm: 0.4 },
      { speedRevPerS: 1, torqueNm: 0.38 },
      { speedRevPerS: 5, torqueNm: 0.3 },
      { speedRevPerS: 10, torqueNm: 0.21 },
    ];
    expect(res.status).toBe(200);
    expect(res.body.motor).toMatchObject({
      id: motor.id,
      shelf: 'motors',
      torqueCurve: expected,
      torqueCurveConditions: { supplyV: 24, currentRmsA: 1.5 },
    });
    expect(res.body.sourceUnits).toEqual({ speed: 'rpm', torque: 'N·cm' });
    expect(res.body.file).toMatchObject({
      partId: motor.id,
      designId: null,
      fileName: 'pull-out.csv',
      mime: 'text/csv',
      size: csv.length,
      canDelete: false,
    });
    expect(shelf.body.torqueCurve).toEqual(expected);
    expect(info.status).toBe(200);
    expect(info.body.file.id).toBe(res.body.file.id);
    const download = await agents.maker.get(`/api/attachments/${res.body.file.id}`);
    expect(download.status).toBe(200);
    expect(download.text).toBe(csv);
    expect(await AuditLog.count({ where: { action: 'part.torque_curve', entityId: motor.id } })).toBe(1);
  });

  it('when the table is in oz·in and rev/s, then torque is converted with 1 ozf·in = 7.061552e-3 N·m (NIST SP 811, 2008, App. B.8)', async () => {
    const motor = await newMotor();
    const res = await post('admin', motor.id, 'speed (rev/s);torque (oz·in)\n0;50\n5;40\n10;25\n', 'curve.csv');
    expect(res.status).toBe(200);
    const curve = res.body.motor.torqueCurve as Array<{ speedRevPerS: number; torqueNm: number }>;
    expect(curve.map((p) => p.speedRevPerS)).toEqual([0, 5, 10]);
    expect(curve[0].torqueNm).toBeCloseTo(50 * 7.061552e-3, 6);
    expect(curve[2].torqueNm).toBeCloseTo(25 * 7.061552e-3, 6);
  });

  it.each([
    ['speed going down', 'speed_rpm,torque_Ncm\n0,40\n300,30\n200,25\n600,20\n', 4, 'speed_rpm', /increase/],
    ['a negative torque', 'speed_rpm,torque_Ncm\n0,40\n300,-3\n600,20\n', 3, 'torque_Ncm', /negative/],
    ['a word for a number', 'speed_rpm,torque_Ncm\n0,40\n300,thirty\n600,20\n', 3, 'torque_Ncm', /not a number/],
    ['no torque at standstill', 'speed_rpm,torque_Ncm\n# measured\n0,0\n300,30\n600,20\n', 3, 'torque_Ncm', /greater than 0/],
    ['a speed beyond the shelf range', 'speed_rps,torque_Nm\n0,0.4\n10,0.3\n2000,0.1\n', 4, 'speed_rps', /1000 rev\/s/],
  ])(
    'when the table has %s, then 400 naming line %i and column %s, and the motor keeps its curve',
    async (_what, csv, line, column, message) => {
      const motor = await newMotor();
      const files = storedFiles().length;
      const res = await post('admin', motor.id, csv);
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('invalid_csv');
      expect(res.body.error.details[0]).toMatchObject({
        line,
        column,
        message: expect.stringMatching(message),
        path: `file · line ${line} · ${column}`,
      });
      expect(await curveOf(motor.id)).toBeNull();
      expect(await Attachment.count({ where: { partId: motor.id } })).toBe(0);
      expect(storedFiles().length).toBe(files);
    },
  );

  it.each([
    ['fewer than 3 points', 'speed_rpm,torque_Ncm\n0,40\n600,20\n', null, null],
    ['a header without units', 'speed,torque\n0,40\n300,30\n600,20\n', 1, 'speed'],
    ['a step-rate column', 'speed_pps,torque_Ncm\n0,40\n300,30\n600,20\n', 1, 'speed_pps'],
  ])('when the table has %s, then 400 with line %s and column %s', async (_what, csv, line, column) => {
    const motor = await newMotor();
    const res = await post('admin', motor.id, csv);
    expect(res.status).toBe(400);
    expect(res.body.error.details[0]).toMatchObject({ line, column });
  });

  it('when a table replaces an earlier one, then the new points win and both source files stay on record', async () => {
    const motor = await newMotor();
    await post('admin', motor.id, 'speed_rpm,torque_Ncm\n0,40\n300,30\n600,20\n');
    const second = await post('admin', motor.id, 'speed_rpm,torque_Ncm\n0,45\n300,35\n600,25\n900,15\n');
    expect(second.status).toBe(200);
    expect(((await curveOf(motor.id)) as unknown[]).length).toBe(4);
    expect(await Attachment.count({ where: { partId: motor.id } })).toBe(2);
    expect((await agents.admin.get(`/api/parts/motors/${motor.id}/torque-curve`)).body.file.id).toBe(second.body.file.id);
    expect((await agents.admin.delete(`/api/attachments/${second.body.file.id}`)).status).toBe(409);
  });

  it.each([
    ['a PNG named .csv', Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 1, 2, 3]), 'curve.csv', 'text/csv'],
    ['a CSV named .pdf', Buffer.from('speed_rpm,torque_Ncm\n0,40\n300,30\n600,20\n'), 'curve.pdf', 'application/pdf'],
    ['binary bytes', Buffer.from([0, 159, 146, 150, 0, 1]), 'curve.csv', 'text/csv'],
  ])('when the file is %s, then 415 and nothing changes', async (_what, bytes, filename, contentType) => {
    const motor = await newMotor();
    const res = await post('admin', motor.id, bytes, filename, contentType);
    expect(res.status).toBe(415);
    expect(await curveOf(motor.id)).toBeNull();
  });

  it('when the file is larger than 64 kB, then 413 and nothing changes', async () => {
    const motor = await newMotor();
    const rows = Array.from({ length: 6000 }, (_, i) => `${i},${(40 - i / 1000).toFixed(4)}`);
    const csv = `speed_rpm,torque_Ncm\n${rows.join('\n')}\n`;
    expect(csv.length).toBeGreaterThan(64 * 1024);
    const res = await post('admin', motor.id, csv);
    expect(res.status).toBe(413);
    expect(res.body.error.message).toContain('64 kB');
    expect(await curveOf(motor.id)).toBeNull();
  });

  it.each([
    ['designer', 403],
    ['maker', 403],
    ['reviewer', 403],
    ['anonymous', 401],
  ] as const)('when a %s uploads a table, then %i', async (who, status) => {
    const motor = await newMotor();
    const res = await post(who, motor.id, 'speed_rpm,torque_Ncm\n0,40\n300,30\n600,20\n');
    expect(res.status).toBe(status);
    expect(await curveOf(motor.id)).toBeNull();
  });

  it.each([
    ['neither the supply nor the current', {}, ['supplyV', 'currentRmsA']],
    ['a supply of zero', { supplyV: '0', currentRmsA: '1.5' }, ['supplyV']],
    ['a current that is not a number', { supplyV: '24', currentRmsA: 'lots' }, ['currentRmsA']],
  ])(
    'when the upload gives %s it was measured at, then 400 names the fields and nothing changes (issue 13)',
    async (_what, fields, paths) => {
      // Arrange
      const motor = await newMotor();
      // Act
      const res = await post('admin', motor.id, 'speed_rpm,torque_Ncm\n0,40\n300,30\n600,20\n', 'curve.csv', 'text/csv', fields);
      // Assert
      expect(res.status).toBe(400);
      expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual([...paths].sort());
      expect(await curveOf(motor.id)).toBeNull();
    },
  );

  it('when the motor does not exist, or the id is a belt, then 404', async () => {
    const belt = await createPart('belt');
    expect((await post('admin', 987654321, 'speed_rpm,torque_Ncm\n0,40\n300,30\n600,20\n')).status).toBe(404);
    expect((await post('admin', belt.id, 'speed_rpm,torque_Ncm\n0,40\n300,30\n600,20\n')).status).toBe(404);
  });
});

describe('the engine uses an uploaded table', () => {
  it('when a design carries the uploaded points (as picking the motor copies them), then the calculation is limited by the table', async () => {
    // Arrange: a table that ends at 240 rpm = 4 rev/s; the model motor reaches far higher speeds at 24 V.
    const motor = await newMotor();
    const uploaded = await post('admin', motor.id, 'speed_rpm,torque_Ncm\n0,40\n120,35\n240,30\n');
    const design = defaultDesign('corexy');
    const withModel = { ...design, motor: { ...design.motor, torqueCurve: null } };
    const withTable = { ...design, motor: { ...design.motor, torqueCurve: uploaded.body.motor.torqueCurve } };
    // Act
    const model = await agents.designer.post('/api/calc').send({ design: withModel });
    const table = await agents.designer.post('/api/calc').send({ design: withTable });
    // Assert: a pure X move turns both CoreXY motors at the carriage speed, so it cannot pass 4 rev/s × travel per rev.
    expect(model.status).toBe(200);
    expect(table.status).toBe(200);
    const limitMPerS = (4 * table.body.drive.travelPerRevMm) / 1000;
    expect(table.body.envelope.axes.x.speedMaxMPerS).toBeLessThanOrEqual(limitMPerS + 1e-9);
    expect(model.body.envelope.axes.x.speedMaxMPerS).toBeGreaterThan(limitMPerS * 1.5);
    expect(table.body.envelope.accelMaxMPerS2).not.toEqual(model.body.envelope.accelMaxMPerS2);
  });
});
