import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { ConfigError, loadConfig } from '../../../server/config';
import { ROOT_DIR } from '../../../server/paths';

const VALID = { DB_PASSWORD: 'a-db-password', JWT_SECRET: 'j'.repeat(32) };

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
    [{ JWT_SECRET: 'short' }, 'JWT_SECRET: must be at least 32 characters'],
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

  it('when production still uses the .env.example placeholders, then it refuses to start', () => {
    expect(() =>
      loadConfig({
        NODE_ENV: 'production',
        DB_PASSWORD: 'change-me-dev-password',
        JWT_SECRET: 'change-me-to-a-random-string-of-32-or-more-characters',
      }),
    ).toThrow(/JWT_SECRET: still the placeholder[\s\S]*DB_PASSWORD: still the placeholder/);
  });
});
