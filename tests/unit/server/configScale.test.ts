import { describe, expect, it } from 'vitest';
import { ConfigError, loadConfig, parseNodeList } from '../../../server/config';

// A secret that passes the signing-secret rule (32 random bytes written out; server/security/secretStrength.ts).
const VALID = { DB_PASSWORD: 'a-db-password', JWT_SECRET: 'Xq3vR9tLm2Wp7sKd4Hf8Jc1Bn6Yg0Za5Ue2Io9Pr3Tw' };

describe('loadConfig (past one machine)', () => {
  it('when nothing about scaling is set, then one database server, the local folder store and the default mail queue timings apply', () => {
    const config = loadConfig(VALID);
    expect(config.db.nodes).toEqual([{ host: '127.0.0.1', port: 3407 }]);
    expect(config.db.readReplicas).toEqual([]);
    expect(config.db).toMatchObject({ syncWait: 1, retryAttempts: 6 });
    expect(config.storage).toEqual({ kind: 'local' });
    expect(config.mailWorkerIntervalMs).toBe(30_000);
    expect(config.mailClaimMs).toBe(120_000);
  });

  it('when DB_NODES lists a cluster, then the nodes are kept in order and the first is the host', () => {
    const config = loadConfig({ ...VALID, DB_NODES: ' 10.0.0.1:3306, db-2.example.test:3307,[::1]:3308 ' });
    expect(config.db.nodes).toEqual([
      { host: '10.0.0.1', port: 3306 },
      { host: 'db-2.example.test', port: 3307 },
      { host: '::1', port: 3308 },
    ]);
    expect(config.db.host).toBe('10.0.0.1');
    expect(config.db.port).toBe(3306);
  });

  it('when DB_READ_REPLICAS is set, then the primary stays DB_HOST and the replicas are listed', () => {
    const config = loadConfig({ ...VALID, DB_HOST: 'primary.example.test', DB_READ_REPLICAS: 'r1.example.test:3306,r2.example.test:3306' });
    expect(config.db.host).toBe('primary.example.test');
    expect(config.db.readReplicas).toEqual(parseNodeList('r1.example.test:3306,r2.example.test:3306'));
  });

  it.each([
    ['DB_NODES', 'db1,db2'],
    ['DB_NODES', '10.0.0.1:3306;10.0.0.2:3306'],
    ['DB_READ_REPLICAS', 'r1:port'],
  ])('when %s is "%s", then the configuration is refused naming it', (key, value) => {
    expect(() => loadConfig({ ...VALID, [key]: value })).toThrow(ConfigError);
    expect(() => loadConfig({ ...VALID, [key]: value })).toThrow(new RegExp(`${key}: a comma-separated list of host:port`));
  });

  it('when STORAGE=s3 with an endpoint, then path-style addressing is on and the prefix loses its slashes', () => {
    const config = loadConfig({
      ...VALID,
      STORAGE: 's3',
      S3_BUCKET: 'gw-files',
      S3_ENDPOINT: 'http://127.0.0.1:4605',
      S3_PREFIX: '/team-a/uploads/',
      S3_ACCESS_KEY_ID: 'key',
      S3_SECRET_ACCESS_KEY: 'secret',
    });
    expect(config.storage).toEqual({
      kind: 's3',
      endpoint: 'http://127.0.0.1:4605',
      region: 'us-east-1',
      bucket: 'gw-files',
      prefix: 'team-a/uploads',
      forcePathStyle: true,
      credentials: { accessKeyId: 'key', secretAccessKey: 'secret' },
    });
  });

  it('when STORAGE=s3 has no endpoint and no keys, then AWS itself with virtual-host addressing and the SDK credential chain is meant', () => {
    const config = loadConfig({ ...VALID, STORAGE: 's3', S3_BUCKET: 'gw-files', S3_REGION: 'eu-central-1' });
    expect(config.storage).toMatchObject({
      kind: 's3',
      region: 'eu-central-1',
      forcePathStyle: false,
      credentials: undefined,
      endpoint: undefined,
    });
  });

  it.each([
    [{ STORAGE: 's3' }, 'S3_BUCKET: is required when STORAGE=s3'],
    [
      { STORAGE: 's3', S3_BUCKET: 'gw-files', S3_ACCESS_KEY_ID: 'only-one' },
      'S3_ACCESS_KEY_ID / S3_SECRET_ACCESS_KEY: set both or neither',
    ],
    [{ STORAGE: 's3', S3_BUCKET: 'GW_Files' }, 'S3_BUCKET: 3 to 63 lower-case letters'],
    [{ STORAGE: 'nfs' }, 'STORAGE'],
    [{ MAIL_CLAIM_SECONDS: '30' }, 'MAIL_CLAIM_SECONDS: must be at least 70'],
  ])('when the storage or mail settings are %o, then the configuration is refused naming the setting', (env, message) => {
    expect(() => loadConfig({ ...VALID, ...env })).toThrow(message);
  });
});
