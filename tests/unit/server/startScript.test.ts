import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { parseEnv } from 'node:util';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { ensureEnvFile } from '../../../scripts/start';
import { ROOT_DIR } from '../../../server/paths';
import { signingSecretProblem } from '../../../server/security/secretStrength';

const EXAMPLE = path.join(ROOT_DIR, '.env.example');
let dir: string;
const envFile = () => path.join(dir, '.env');
const read = () => parseEnv(fs.readFileSync(envFile(), 'utf8')) as Record<string, string>;

beforeEach(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'gw-start-env-'));
});
afterEach(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('ensureEnvFile', () => {
  it('when there is no .env, then it copies .env.example with random secrets that pass the secret rule', () => {
    // Act
    const said = ensureEnvFile({ env: envFile(), example: EXAMPLE });
    // Assert
    const env = read();
    expect(said).toEqual(['Created .env with a random JWT_SECRET, DB_PASSWORD, DB_OWNER_PASSWORD.']);
    expect(signingSecretProblem(env.JWT_SECRET)).toBeNull();
    expect(env.DB_PASSWORD).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(env.DB_OWNER_PASSWORD).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(env.PORT).toBe('5180');
    expect(fs.statSync(envFile()).mode & 0o077).toBe(0);
  });

  // fix: #12 — an existing .env copied from the example kept its public placeholder secret.
  it('when an existing .env still holds the example placeholders, then it replaces them and says so, keeping other lines', () => {
    // Arrange
    const example = fs.readFileSync(EXAMPLE, 'utf8').replace(/^PORT=.*$/m, 'PORT=5200');
    fs.writeFileSync(envFile(), example);
    const before = parseEnv(example) as Record<string, string>;
    // Act
    const said = ensureEnvFile({ env: envFile(), example: EXAMPLE });
    // Assert
    const env = read();
    expect(said).toHaveLength(3);
    expect(said[0]).toMatch(/^Replaced the placeholder JWT_SECRET in \.env with a random value/);
    expect(env.JWT_SECRET).not.toBe(before.JWT_SECRET);
    expect(signingSecretProblem(env.JWT_SECRET)).toBeNull();
    expect(env.DB_PASSWORD).not.toBe(before.DB_PASSWORD);
    expect(env.DB_OWNER_PASSWORD).not.toBe(before.DB_OWNER_PASSWORD);
    expect(env.PORT).toBe('5200');
  });

  it('when the secrets are real, then nothing changes; a missing owner password is added', () => {
    // Arrange
    const text = 'JWT_SECRET=Xq3vR9tLm2Wp7sKd4Hf8Jc1Bn6Yg0Za5Ue2Io9Pr3Tw\nDB_PASSWORD=kept-db-password\n';
    fs.writeFileSync(envFile(), text);
    // Act
    const said = ensureEnvFile({ env: envFile(), example: EXAMPLE });
    // Assert
    expect(said).toEqual(['Added a random DB_OWNER_PASSWORD to .env.']);
    expect(read()).toMatchObject({ JWT_SECRET: 'Xq3vR9tLm2Wp7sKd4Hf8Jc1Bn6Yg0Za5Ue2Io9Pr3Tw', DB_PASSWORD: 'kept-db-password' });
  });

  it('when the database is not local, then its placeholder passwords are reported, not replaced (they must match that server)', () => {
    // Arrange
    fs.writeFileSync(
      envFile(),
      'DB_HOST=db.example.test\nDB_PASSWORD=change-me-dev-password\nDB_OWNER_PASSWORD=kept-owner\nJWT_SECRET=change-me\n',
    );
    // Act
    const said = ensureEnvFile({ env: envFile(), example: EXAMPLE });
    // Assert
    expect(said[0]).toMatch(/^Replaced the placeholder JWT_SECRET/);
    expect(said[1]).toBe('DB_PASSWORD in .env is still a placeholder; set it to the password of db.example.test.');
    expect(read().DB_PASSWORD).toBe('change-me-dev-password');
  });

  it('when DB_NODES names a cluster on loopback, then its passwords are not invented either (the cluster has its own accounts)', () => {
    // Arrange
    fs.writeFileSync(
      envFile(),
      'DB_HOST=127.0.0.1\nDB_NODES=127.0.0.1:4621,127.0.0.1:4622\nDB_PASSWORD=change-me-dev-password\nJWT_SECRET=Xq3vR9tLm2Wp7sKd4Hf8Jc1Bn6Yg0Za5Ue2Io9Pr3Tw\n',
    );
    // Act
    const said = ensureEnvFile({ env: envFile(), example: EXAMPLE });
    // Assert
    expect(said).toEqual(['DB_PASSWORD in .env is still a placeholder; set it to the password of 127.0.0.1:4621,127.0.0.1:4622.']);
    expect(read().DB_PASSWORD).toBe('change-me-dev-password');
    expect(read().DB_OWNER_PASSWORD).toBeUndefined();
  });
});
