import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { compareMechanisms, defaultDesign, ENGINE_VERSION, evaluateDesign, sweep, type DesignInput } from '@/engine';
import { createApp } from '../../server/app';
import { closeSequelize } from '../../server/db';
import type { Role } from '../../server/models';
import { signedInAs, type Agent } from '../helpers/factories';

const app = createApp();
afterAll(() => closeSequelize());

type Who = 'admin' | 'designer' | 'reviewer' | 'maker' | 'none';
const agents = {} as Record<Who, Agent>;

beforeAll(async () => {
  for (const who of ['admin', 'designer', 'reviewer', 'maker', 'none'] as const) {
    agents[who] = (await signedInAs(app, who === 'none' ? [] : [who as Role])).agent;
  }
});

/** What JSON makes of a value (Infinity → null, undefined dropped): the shape the API can answer. */
const overJson = <T>(value: T): unknown => JSON.parse(JSON.stringify(value));

function design(edit: (d: DesignInput) => DesignInput = (d) => d): DesignInput {
  return edit({ ...defaultDesign('corexy'), name: 'Calc test stage' });
}

describe('POST /api/calc', () => {
  it.each(['admin', 'designer', 'reviewer', 'maker'] as Who[])(
    'when a signed-in %s user posts a design, then 200 with the engine result',
    async (who) => {
      const doc = design((d) => ({ ...d, frame: { ...d.frame, outerXMm: 520 } }));

      const res = await agents[who].post('/api/calc').send({ design: doc });

      expect(res.status).toBe(200);
      expect(res.body).toEqual(overJson(evaluateDesign(doc)));
      expect(res.body.engineVersion).toBe(ENGINE_VERSION);
    },
  );

  it('when the design lists a job, then the answer carries every second-layer section and times the job', async () => {
    // Arrange
    const doc = design((d) => ({
      ...d,
      job: {
        points: [
          { xMm: 10, yMm: 10, dwellS: 0.2 },
          { xMm: 150, yMm: 90, dwellS: 0 },
        ],
      },
    }));
    // Act
    const res = await agents.designer.post('/api/calc').send({ design: doc });
    // Assert
    expect(res.status).toBe(200);
    for (const key of ['errorBudget', 'modes', 'shaping', 'excitation', 'heat', 'loads', 'job']) expect(res.body[key], key).toBeDefined();
    expect(res.body.stiffness.lowest.modeId).toBe(res.body.modes[0].id);
    expect(res.body.job.moves).toHaveLength(1);
    expect(res.body.job.totalS).toBeCloseTo(res.body.job.moves[0].timeS + 0.2, 9);
    expect(res.body.checks.map((c: { id: string }) => c.id)).toEqual(expect.arrayContaining(['step-rate', 'shaft-load', 'job-travel']));
  });

  it('when a job point has a bad dwell, then 400 names design.job.points.0.dwellS', async () => {
    const doc = design((d) => ({ ...d, job: { points: [{ xMm: 1, yMm: 1, dwellS: -2 }] } }));
    const res = await agents.designer.post('/api/calc').send({ design: doc });
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((x: { path: string }) => x.path)).toContain('design.job.points.0.dwellS');
  });

  // fix: #12 — an account without a role could use the engine.
  it('when an account without a role posts a design, then 403', async () => {
    const res = await agents.none.post('/api/calc').send({ design: design() });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('forbidden');
  });

  it('when the inputs change, then the result changes with them (not a cached answer)', async () => {
    const small = await agents.maker.post('/api/calc').send({ design: design() });
    const teeth32 = await agents.maker
      .post('/api/calc')
      .send({ design: design((d) => ({ ...d, pulley: { ...d.pulley, driveTeeth: 32 } })) });

    // steps/mm = full steps per rev × microsteps / (teeth × pitch): 200 × 16 / (20 × 2) = 80, and 50 with 32 teeth.
    expect(small.body.drive.stepsPerMm).toBeCloseTo(80, 9);
    expect(teeth32.body.drive.stepsPerMm).toBeCloseTo(50, 9);
  });

  it('when a design omits optional fields, then the defaults apply as in the engine', async () => {
    const { map: _m, frictionN: _f, ...partial } = design();
    const res = await agents.designer.post('/api/calc').send({ design: partial });
    expect(res.status).toBe(200);
    expect(res.body.stiffness.xMm).toHaveLength(41);
  });

  it('when a design is posted, then the answer carries the corrected figures: tension over the travel, microstep figures, checks with parts', async () => {
    // Arrange
    const doc = design((d) => ({ ...d, pretensionN: 12 }));
    // Act
    const res = await agents.designer.post('/api/calc').send({ design: doc });
    // Assert
    expect(res.status).toBe(200);
    expect(Object.keys(res.body.drive.microstep).sort()).toEqual(['axisMm', 'diagonalMm', 'oneMotorDirectionDeg', 'oneMotorMm']);
    for (const b of res.body.belts) {
      expect(b.tension.worstSlackAt).toEqual({ xMm: expect.any(Number), yMm: expect.any(Number), directionDeg: expect.any(Number) });
      expect(b.tension.tensileAllowableN).toBe(doc.belt.allowableTensionN);
    }
    const slack = res.body.checks.filter((c: { id: string }) => c.id === 'belt-slack');
    expect(slack.map((c: { subject: string; severity: string }) => [c.subject, c.severity])).toEqual([
      ['Belt A', 'fail'],
      ['Belt B', 'fail'],
    ]);
    expect(slack[0].parts.length).toBeGreaterThan(1);
  });

  it('when the step angle is not a two-phase one, then 400 naming design.motor.stepAngleDeg', async () => {
    // Arrange / Act
    const res = await agents.designer
      .post('/api/calc')
      .send({ design: design((d) => ({ ...d, motor: { ...d.motor, stepAngleDeg: 1.2 } })) });
    // Assert
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((x: { path: string }) => x.path)).toEqual(['design.motor.stepAngleDeg']);
    expect(res.body.error.details[0].message).toMatch(/two-phase/);
  });

  it('when not signed in, then 401', async () => {
    const res = await request(app).post('/api/calc').send({ design: design() });
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
  });

  it.each([
    {
      what: 'microsteps 3',
      body: { design: design((d) => ({ ...d, driver: { ...d.driver, microsteps: 3 } })) },
      paths: ['design.driver.microsteps'],
    },
    { what: 'an unknown field', body: { design: { ...design(), colour: 'blue' } }, paths: ['design.colour'] },
    {
      what: 'a negative belt pitch',
      body: { design: design((d) => ({ ...d, belt: { ...d.belt, pitchMm: -2 } })) },
      paths: ['design.belt.pitchMm'],
    },
    { what: 'no design', body: {}, paths: ['design'] },
    { what: 'a design that is not an object', body: { design: 'corexy' }, paths: ['design'] },
    { what: 'an extra body field', body: { design: design(), verbose: true }, paths: ['verbose'] },
  ])('when the body has $what, then 400 names $paths', async ({ body, paths }) => {
    const res = await agents.designer.post('/api/calc').send(body);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect((res.body.error.details as Array<{ path: string }>).map((d) => d.path)).toEqual(paths);
  });

  it('when microsteps is 3, then the message is the one the form shows', async () => {
    const res = await agents.designer.post('/api/calc').send({ design: design((d) => ({ ...d, driver: { ...d.driver, microsteps: 3 } })) });
    expect(res.body.error.details[0].message).toBe('microsteps must be a power of two from 1 to 256 (1, 2, 4, 8, 16, 32, 64, 128, 256)');
  });
});

describe('POST /api/calc/compare', () => {
  it('when a maker compares, then 200 with one row per mechanism as the engine gives them', async () => {
    const doc = design();

    const res = await agents.maker.post('/api/calc/compare').send({ design: doc });

    expect(res.status).toBe(200);
    expect(res.body).toEqual(overJson(compareMechanisms(doc)));
    expect(res.body.rows.map((r: { mechanism: string }) => r.mechanism).sort()).toEqual(['cartesian', 'corexy', 'hbot']);
  });

  it('when not signed in, then 401; when invalid, then 400 naming the field', async () => {
    const anonymous = await request(app).post('/api/calc/compare').send({ design: design() });
    const invalid = await agents.designer
      .post('/api/calc/compare')
      .send({ design: design((d) => ({ ...d, masses: { ...d.masses, carriageKg: -1 } })) });

    expect(anonymous.status).toBe(401);
    expect(invalid.status).toBe(400);
    expect(invalid.body.error.details.map((d: { path: string }) => d.path)).toEqual(['design.masses.carriageKg']);
  });
});

describe('POST /api/calc/sweep', () => {
  it('when sweeping drive pulley teeth, then one point per value matching the engine, resolution falling as teeth grow', async () => {
    const doc = design();
    const values = [16, 20, 24, 32];

    const res = await agents.reviewer.post('/api/calc/sweep').send({ design: doc, path: 'pulley.driveTeeth', values });

    expect(res.status).toBe(200);
    expect(res.body).toEqual(overJson(sweep(doc, 'pulley.driveTeeth', values)));
    const stepsPerMm = (res.body.points as Array<{ stepsPerMm: number }>).map((p) => p.stepsPerMm);
    // 200 full steps × 16 microsteps / (teeth × 2 mm)
    expect(stepsPerMm[0]).toBeCloseTo(100, 9);
    expect(stepsPerMm[3]).toBeCloseTo(50, 9);
  });

  it('when one value is invalid, then that point carries its issue and the others are computed', async () => {
    const res = await agents.designer.post('/api/calc/sweep').send({ design: design(), path: 'pulley.driveTeeth', values: [3, 20] });

    expect(res.status).toBe(200);
    expect(res.body.points[0]).toMatchObject({ value: 3, ok: false, issues: [{ path: 'pulley.driveTeeth' }] });
    expect(res.body.points[1]).toMatchObject({ value: 20, ok: true });
  });

  it.each([
    { what: '51 values', body: { path: 'pulley.driveTeeth', values: Array.from({ length: 51 }, (_, i) => 10 + i) }, paths: ['values'] },
    { what: 'no values', body: { path: 'pulley.driveTeeth', values: [] }, paths: ['values'] },
    { what: 'a text value', body: { path: 'pulley.driveTeeth', values: [20, 'many'] }, paths: ['values.1'] },
    { what: 'a path that is not a field', body: { path: 'frame.colour', values: [1] }, paths: ['path'] },
    { what: 'a path to a group of fields', body: { path: 'frame', values: [1] }, paths: ['path'] },
    { what: 'a path to a text field', body: { path: 'mechanism', values: [1] }, paths: ['path'] },
    { what: 'a malformed path', body: { path: 'frame..outerXMm', values: [1] }, paths: ['path'] },
    { what: 'no path', body: { values: [1] }, paths: ['path'] },
  ])('when the sweep has $what, then 400 names $paths', async ({ body, paths }) => {
    const res = await agents.designer.post('/api/calc/sweep').send({ design: design(), ...body });
    expect(res.status).toBe(400);
    expect((res.body.error.details as Array<{ path: string }>).map((d) => d.path)).toEqual(paths);
  });

  it('when 50 values are asked for, then all 50 are computed', async () => {
    const values = Array.from({ length: 50 }, (_, i) => 300 + 10 * i);
    const coarse = design((d) => ({ ...d, map: { points: 5 } }));
    const res = await agents.designer.post('/api/calc/sweep').send({ design: coarse, path: 'frame.outerXMm', values });
    expect(res.status).toBe(200);
    expect(res.body.points).toHaveLength(50);
    expect(res.body.points[49].travelXMm - res.body.points[0].travelXMm).toBeCloseTo(490, 6);
  });

  it('when not signed in, then 401', async () => {
    const res = await request(app)
      .post('/api/calc/sweep')
      .send({ design: design(), path: 'pulley.driveTeeth', values: [20] });
    expect(res.status).toBe(401);
  });
});
