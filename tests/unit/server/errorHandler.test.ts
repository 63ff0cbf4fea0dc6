import express from 'express';
import request from 'supertest';
import { z } from 'zod';
import { UniqueConstraintError, ConnectionError } from 'sequelize';
import { describe, expect, it, vi } from 'vitest';
import { AppError } from '../../../server/errors';
import { errorHandlerMiddleware, toErrorResponse } from '../../../server/middleware/errorHandler';
import { requestIdMiddleware } from '../../../server/middleware/requestId';
import { validate } from '../../../server/middleware/validate';
import { getLogger } from '../../../server/logger';

process.env.DB_PASSWORD ??= 'unit-test-password';
process.env.JWT_SECRET ??= 'Xq3vR9tLm2Wp7sKd4Hf8Jc1Bn6Yg0Za5Ue2Io9Pr3Tw';

/** A tiny app whose only route throws `err`, wired like the real one. */
function appThrowing(err: unknown) {
  const app = express();
  app.use(requestIdMiddleware());
  app.get('/boom', async () => {
    throw err;
  });
  app.use(errorHandlerMiddleware());
  return app;
}

describe('errorHandlerMiddleware', () => {
  it('when an unknown error is thrown, then 500 internal_error JSON without the error text, with the request id, and it is logged', async () => {
    const spy = vi.spyOn(getLogger(), 'error').mockImplementation(() => undefined);
    const res = await request(appThrowing(new TypeError("Cannot read properties of undefined (reading 'secretColumn')"))).get('/boom');

    expect(res.status).toBe(500);
    expect(res.body.error.code).toBe('internal_error');
    expect(res.body.error.message).toContain(res.headers['x-request-id']);
    expect(JSON.stringify(res.body)).not.toContain('secretColumn');
    expect(spy).toHaveBeenCalledTimes(1);
    spy.mockRestore();
  });

  it('when an AppError is thrown, then its status, code, message and details are sent', async () => {
    const err = new AppError('state_conflict', 'The design is already in review.', 409, {
      details: [{ path: 'status', message: 'is in_review' }],
    });
    const res = await request(appThrowing(err)).get('/boom');
    expect(res.status).toBe(409);
    expect(res.body).toEqual({
      error: {
        code: 'state_conflict',
        message: 'The design is already in review.',
        details: [{ path: 'status', message: 'is in_review' }],
      },
    });
  });

  it('when the error handler sees a ZodError from a service, then 400 with field paths', async () => {
    const parsed = z.object({ frame: z.object({ widthMm: z.number().positive() }) }).safeParse({ frame: { widthMm: -1 } });
    const res = await request(appThrowing(parsed.error)).get('/boom');
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('frame.widthMm');
  });
});

describe('toErrorResponse', () => {
  it('when an engine input error arrives, then 400 invalid_input with its message', () => {
    const err = Object.assign(new Error('[beltTension] span length must be positive'), { name: 'EngineInputError' });
    expect(toErrorResponse(err)).toMatchObject({
      status: 400,
      body: { error: { code: 'invalid_input', message: '[beltTension] span length must be positive' } },
    });
  });

  it('when a unique constraint fails, then 409 conflict naming the field', () => {
    const err = new UniqueConstraintError({ errors: [{ path: 'email', message: 'email must be unique' } as never] });
    expect(toErrorResponse(err)).toMatchObject({
      status: 409,
      body: { error: { code: 'conflict', details: [{ path: 'email', message: 'is already taken' }] } },
    });
  });

  it('when the database connection fails, then 503 db_unavailable (not a bug)', () => {
    const result = toErrorResponse(new ConnectionError(new Error('ECONNREFUSED')));
    expect(result).toMatchObject({ status: 503, isBug: false, body: { error: { code: 'db_unavailable' } } });
  });

  it('when an upload is too large (multer), then 413', () => {
    const err = Object.assign(new Error('File too large'), { name: 'MulterError', code: 'LIMIT_FILE_SIZE', field: 'file' });
    expect(toErrorResponse(err)).toMatchObject({ status: 413, body: { error: { code: 'payload_too_large' } } });
  });
});

describe('validate', () => {
  const app = express();
  app.use(express.json());
  app.post(
    '/items/:id',
    validate({
      params: z.object({ id: z.string().regex(/^\d+$/).transform(Number) }),
      query: z.object({ dryRun: z.enum(['yes', 'no']).default('no') }),
      body: z.strictObject({ qty: z.number().int(), tags: z.array(z.string()).optional() }),
    }),
    (req, res) => {
      res.json({ params: req.params, query: req.query, body: req.body });
    },
  );
  app.use(errorHandlerMiddleware());

  it('when everything is valid, then the handler reads the parsed, coerced values', async () => {
    const res = await request(app).post('/items/7?dryRun=yes').send({ qty: 3 });
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ params: { id: 7 }, query: { dryRun: 'yes' }, body: { qty: 3 } });
  });

  it('when params, query and body are all wrong, then one 400 lists every problem with its path', async () => {
    const res = await request(app)
      .post('/items/x?dryRun=maybe')
      .send({ qty: 1.5, tags: ['a', 2], extra: true });
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path)).toEqual(['id', 'dryRun', 'qty', 'tags.1', 'extra']);
  });
});
