import { promisify } from 'node:util';
import { brotliCompress, constants, gzip } from 'node:zlib';
import fs from 'node:fs/promises';
import path from 'node:path';
import type { Plugin, ResolvedConfig } from 'vite';

const brotli = promisify(brotliCompress);
const gz = promisify(gzip);

/** File types worth compressing (fonts and images are compressed already). */
const COMPRESSIBLE = /\.(js|mjs|css|html|svg|json|txt|map)$/i;
/** Smaller files are sent as they are: compression would save less than the extra round of headers. */
const MIN_BYTES = 1024;

/**
 * Vite plugin: after the build, writes `<file>.br` (brotli, quality 11) and `<file>.gz` (gzip, level 9) beside
 * every compressible file of the output, so that the server sends compressed bytes without compressing on each
 * request (server/middleware/precompressed.ts picks the variant the browser accepts).
 * A compressed variant that is not smaller than the original is not written.
 */
export function precompressPlugin(): Plugin {
  let config: ResolvedConfig;
  return {
    name: 'gantrywright-precompress',
    apply: 'build',
    configResolved(resolved) {
      config = resolved;
    },
    async closeBundle() {
      const outDir = path.resolve(config.root, config.build.outDir);
      const files = await listFiles(outDir);
      await Promise.all(
        files
          .filter((f) => COMPRESSIBLE.test(f) && !f.includes(`${path.sep}.vite${path.sep}`))
          .map(async (file) => {
            const bytes = await fs.readFile(file);
            if (bytes.length < MIN_BYTES) return;
            const [br, gzipped] = await Promise.all([
              brotli(bytes, {
                params: {
                  [constants.BROTLI_PARAM_QUALITY]: constants.BROTLI_MAX_QUALITY,
                  [constants.BROTLI_PARAM_SIZE_HINT]: bytes.length,
                  [constants.BROTLI_PARAM_MODE]: constants.BROTLI_MODE_TEXT,
                },
              }),
              gz(bytes, { level: 9 }),
            ]);
            if (br.length < bytes.length) await fs.writeFile(`${file}.br`, br);
            if (gzipped.length < bytes.length) await fs.writeFile(`${file}.gz`, gzipped);
          }),
      );
    },
  };
}

async function listFiles(dir: string): Promise<string[]> {
  const out: string[] = [];
  for (const entry of await fs.readdir(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) out.push(...(await listFiles(full)));
    else out.push(full);
  }
  return out;
}

/**
 * Vite plugin: writes `.vite/chunk-modules.json` into the output, mapping every JS chunk to the source modules in
 * it (paths relative to the project), so `npm run bench` can tell which pages load the engine, mathjs or plotly.
 * The server never serves the `.vite` folder (dot folders are ignored by express.static).
 */
export function chunkModulesPlugin(): Plugin {
  let root = '';
  return {
    name: 'gantrywright-chunk-modules',
    apply: 'build',
    configResolved(resolved) {
      root = resolved.root;
    },
    generateBundle(_options, bundle) {
      const map: Record<string, string[]> = {};
      for (const [file, chunk] of Object.entries(bundle)) {
        if (chunk.type !== 'chunk') continue;
        map[file] = Object.keys(chunk.modules).map((id) => path.relative(root, id.replace(/\?.*$/, '').replace(/^\0/, '')));
      }
      this.emitFile({ type: 'asset', fileName: '.vite/chunk-modules.json', source: JSON.stringify(map) });
    },
  };
}
