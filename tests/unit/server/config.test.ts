import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { randomBytes } from 'node:crypto';
import { ConfigError, loadConfig } from '../../../server/config';
import { ROOT_DIR } from '../../../server/paths';
import { exampleEnvValues } from '../../../server/security/secretStrength';

/** 32 random bytes, as npm start writes them. */
const SECRET = randomBytes(32).toString('base64url');
const VALID = { DB_PASSWORD: 'a-db-password', JWT_SECRET: SECRET };

describe('loadConfig', () => {
  it('when only the two secrets are given, then every other setting takes the documented default', () => {
    const config = loadConfig(VALID);
    expect(config).toMatchObject({
      nodeEnv: 'development',
      host: '127.0.0.1',
      port: 5180,
      appUrl: 'http://127.0.0.1:5180',
      db: { host: '127.0.0.1', port: 3407, name: 'gantrywright', user: 'gantry', password: 'a-db-password' },
      sessionHours: 12,
      smtp: { host: '127.0.0.1', port: 2526, secure: false },
      mailcatcherHttpPort: 2527,
      mailFrom: 'Gantrywright <noreply@example.test>',
      loginRateLimit: 10,
      loginRateWindowMinutes: 15,
      trustProxy: false,
      logLevel: 'info',
    });
    expect(config.dataDir).toBe(path.join(ROOT_DIR, '.data'));
    expect(config.uploadDir).toBe(path.join(ROOT_DIR, '.data', 'uploads'));
    expect(config.workers).toEqual({ engineThreads: os.availableParallelism(), pdfThreads: 1, nice: 10 });
  });

  it('when WORKER_NICE is given, then 0–19 is taken and anything else is refused naming the variable', () => {
    expect(loadConfig({ ...VALID, WORKER_NICE: '0', ENGINE_THREADS: '3' }).workers).toMatchObject({ engineThreads: 3, nice: 0 });
    expect(() => loadConfig({ ...VALID, WORKER_NICE: '20' })).toThrow(/WORKER_NICE/);
    expect(() => loadConfig({ ...VALID, WORKER_NICE: '-5' })).toThrow(/WORKER_NICE/);
  });

  it('when values are given as strings, then numbers are coerced and paths resolved against the repository', () => {
    const config = loadConfig({
      ...VALID,
      PORT: '6000',
      DB_PORT: '3417',
      DATA_DIR: '.data-test',
      UPLOAD_DIR: '/srv/up',
      APP_URL: 'https://gw.example.test/',
      TRUST_PROXY: '1',
    });
    expect(config.port).toBe(6000);
    expect(config.db.port).toBe(3417);
    expect(config.dataDir).toBe(path.join(ROOT_DIR, '.data-test'));
    expect(config.uploadDir).toBe('/srv/up');
    expect(config.appUrl).toBe('https://gw.example.test');
    expect(config.trustProxy).toBe(1);
  });

  it('when NODE_ENV is test, then logging defaults to silent', () => {
    expect(loadConfig({ ...VALID, NODE_ENV: 'test' }).logLevel).toBe('silent');
  });

  it('when empty strings are given (as in .env.example), then defaults apply', () => {
    expect(loadConfig({ ...VALID, LOG_LEVEL: '', UPLOAD_DIR: '', PORT: '' }).port).toBe(5180);
  });

  it.each([
    [{ JWT_SECRET: 'short' }, 'JWT_SECRET: must carry at least 32 random bytes: at least 43 characters (got 5)'],
    [{ JWT_SECRET: undefined }, 'JWT_SECRET: is required'],
    [{ DB_PASSWORD: undefined }, 'DB_PASSWORD: is required'],
    [{ PORT: 'eighty' }, 'PORT:'],
    [{ DB_PORT: '70000' }, 'DB_PORT:'],
    [{ NODE_ENV: 'staging' }, 'NODE_ENV:'],
    [{ APP_URL: 'ftp://x' }, 'APP_URL: must be an http(s) URL'],
    [{ DB_NAME: 'drop;table' }, 'DB_NAME: letters, digits and _ only'],
    [{ LOGIN_RATE_LIMIT: '0' }, 'LOGIN_RATE_LIMIT:'],
  ])('when %o, then ConfigError names the variable', (override, expected) => {
    const env = { ...VALID, ...override } as Record<string, string | undefined>;
    expect(() => loadConfig(env)).toThrow(ConfigError);
    expect(() => loadConfig(env)).toThrow(expected);
  });

  it('when several variables are wrong, then the message lists all of them', () => {
    expect(() => loadConfig({ PORT: 'x' })).toThrow(
      /PORT[\s\S]*DB_PASSWORD[\s\S]*JWT_SECRET|DB_PASSWORD[\s\S]*JWT_SECRET[\s\S]*PORT|PORT[\s\S]*JWT_SECRET/,
    );
    try {
      loadConfig({ PORT: 'x' });
    } catch (err) {
      const message = (err as Error).message;
      for (const name of ['PORT', 'DB_PASSWORD', 'JWT_SECRET']) expect(message).toContain(`${name}:`);
    }
  });

  // fix: #12 — development and test accepted the placeholder, so a token signed with the public value was an admin.
  it.each(['development', 'test', 'production'])(
    'when NODE_ENV is %s and the secrets are still the .env.example placeholders, then it refuses to start naming each',
    (nodeEnv) => {
      const example = exampleEnvValues();
      expect(example.JWT_SECRET).toMatch(/^change-me/);
      const env = {
        NODE_ENV: nodeEnv,
        DB_PASSWORD: example.DB_PASSWORD,
        JWT_SECRET: example.JWT_SECRET,
        DB_OWNER_PASSWORD: example.DB_OWNER_PASSWORD,
      };
      expect(() => loadConfig(env)).toThrow(ConfigError);
      expect(() => loadConfig(env)).toThrow(
        /DB_PASSWORD: is a placeholder[\s\S]*DB_OWNER_PASSWORD: is a placeholder[\s\S]*JWT_SECRET: is a placeholder/,
      );
    },
  );

  it.each([
    ['any other "change-me" value', `change-me-${'x'.repeat(60)}`, 'is a placeholder'],
    ['42 base64url characters (31 bytes)', randomBytes(32).toString('base64url').slice(0, 42), 'at least 43 characters'],
    ['63 hex digits', randomBytes(32).toString('hex').slice(0, 63), 'at least 64 characters of hex'],
    ['one character repeated', 'j'.repeat(64), 'does not look random'],
    ['a short piece repeated', 'abcdefghijk'.repeat(5), 'does not look random'],
  ])('when JWT_SECRET is %s, then ConfigError says why in every mode', (_label, secret, expected) => {
    for (const NODE_ENV of ['development', 'test', 'production']) {
      expect(() => loadConfig({ ...VALID, NODE_ENV, JWT_SECRET: secret })).toThrow(new RegExp(`JWT_SECRET: [^\\n]*${expected}`));
    }
  });

  it.each([
    ['32 random bytes in base64url', randomBytes(32).toString('base64url')],
    ['32 random bytes in base64 (openssl rand -base64 32)', randomBytes(32).toString('base64')],
    ['32 random bytes in hex', randomBytes(32).toString('hex')],
  ])('when JWT_SECRET is %s, then it is accepted', (_label, secret) => {
    expect(loadConfig({ ...VALID, JWT_SECRET: secret }).jwtSecret).toBe(secret);
  });

  it('when DB_OWNER_PASSWORD is set, then migrations get the owner account; without it, none', () => {
    expect(loadConfig({ ...VALID, DB_OWNER_PASSWORD: 'owner-secret-1' }).dbOwner).toEqual({
      user: 'gantry_owner',
      password: 'owner-secret-1',
    });
    expect(loadConfig(VALID).dbOwner).toBeNull();
  });
});
