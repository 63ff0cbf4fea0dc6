import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { brotliCompressSync, gzipSync } from 'node:zlib';
import express from 'express';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { acceptedEncodings, precompressedAssetsMiddleware, sendBuilt } from '../../../server/middleware/precompressed';

let dist: string;
const JS = `export const answer = ${'42 + '.repeat(400)}0;\n`;

beforeAll(() => {
  dist = fs.mkdtempSync(path.join(os.tmpdir(), 'gw-precompressed-'));
  fs.mkdirSync(path.join(dist, 'assets'));
  const file = path.join(dist, 'assets', 'index-abc123.js');
  fs.writeFileSync(file, JS);
  fs.writeFileSync(`${file}.br`, brotliCompressSync(JS));
  fs.writeFileSync(`${file}.gz`, gzipSync(JS));
  fs.writeFileSync(path.join(dist, 'assets', 'plain-abc123.js'), JS); // no compressed variants
  fs.writeFileSync(path.join(dist, 'index.html'), '<!doctype html><title>t</title>');
});
afterAll(() => fs.rmSync(dist, { recursive: true, force: true }));

function app() {
  const a = express();
  a.use(precompressedAssetsMiddleware(dist));
  a.get('/', (req, res, next) => void sendBuilt(req, res, path.join(dist, 'index.html'), 'no-cache').catch(next));
  return a;
}

describe('precompressedAssetsMiddleware', () => {
  it('when the browser accepts brotli, then the .br bytes go out with Content-Encoding, Vary, the JS type and immutable caching', async () => {
    // Arrange
    const agent = request(app());

    // Act
    const res = await agent
      .get('/assets/index-abc123.js')
      .set('Accept-Encoding', 'gzip, deflate, br')
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });

    // Assert
    expect(res.status).toBe(200);
    expect(res.headers['content-encoding']).toBe('br');
    expect(res.headers.vary).toMatch(/Accept-Encoding/);
    expect(res.headers['content-type']).toMatch(/^text\/javascript|^application\/javascript/);
    expect(res.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    expect(Number(res.headers['content-length'])).toBe(brotliCompressSync(JS).length);
  });

  it('when the browser accepts gzip only, then the .gz variant is sent and decodes to the original', async () => {
    const res = await request(app()).get('/assets/index-abc123.js').set('Accept-Encoding', 'gzip');

    expect(res.headers['content-encoding']).toBe('gzip');
    expect(res.text).toBe(JS); // supertest gunzips
  });

  it('when the browser accepts no compression, then the file goes out as it is', async () => {
    const res = await request(app()).get('/assets/index-abc123.js').set('Accept-Encoding', 'identity');

    expect(res.headers['content-encoding']).toBeUndefined();
    expect(res.text).toBe(JS);
  });

  it('when an asset has no compressed variant, then it is sent uncompressed with the same caching', async () => {
    const res = await request(app()).get('/assets/plain-abc123.js').set('Accept-Encoding', 'br');

    expect(res.headers['content-encoding']).toBeUndefined();
    expect(res.headers['cache-control']).toContain('immutable');
  });

  it.each(['/assets/index-abc123.js.br', '/assets/..%2Findex.html', '/assets/missing.js'])(
    'when %s is asked for, then the middleware passes (404)',
    async (url) => {
      const res = await request(app()).get(url).set('Accept-Encoding', 'br');

      expect(res.status).toBe(404);
    },
  );

  it('when index.html is served, then it is revalidated on every visit', async () => {
    const res = await request(app()).get('/').set('Accept-Encoding', 'br');

    expect(res.headers['cache-control']).toBe('no-cache');
    expect(res.text).toContain('<title>t</title>');
  });
});

describe('acceptedEncodings', () => {
  it.each([
    ['gzip, deflate, br', ['br', 'gzip']],
    ['br;q=0, gzip', ['gzip']],
    ['*', ['br', 'gzip']],
    ['identity', []],
    [undefined, []],
  ])('when Accept-Encoding is %s, then %j are usable', (header, expected) => {
    expect(acceptedEncodings(header)).toEqual(expected);
  });
});
