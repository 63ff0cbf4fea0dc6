import { spawnSync } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { ROOT_DIR } from '../../server/paths';
import { atMost, info, say, type Figure } from './lib';

/**
 * Bundle part of `npm run bench`: builds the client, then adds up from the Vite manifest what each page loads
 * before it shows anything (the entry and the page's chunk with everything they import), compressed as the server
 * sends it (.br), and checks what the list pages must not load. Finally it asks a running app for an asset and
 * index.html and checks the encoding and caching headers.
 */

type Manifest = Record<
  string,
  { file: string; imports?: string[]; dynamicImports?: string[]; isEntry?: boolean; isDynamicEntry?: boolean }
>;

const DIST = path.join(ROOT_DIR, 'dist');

/**
 * Sign-in and every list page (src/router: each screen that lists designs, reviews, sheets, parts, people or mail):
 * the pages people see before any plot. None of them may load the engine, mathjs, plotly or the plot component;
 * sign-in and the designs list also have a size target.
 */
const PAGES: { key: string; label: string; id: string }[] = [
  { key: 'src/views/auth/SignInView.vue', label: 'sign-in', id: 'signIn' },
  { key: 'src/views/designs/DesignsView.vue', label: 'designs list', id: 'designs' },
  { key: 'src/views/review/ReviewDeskView.vue', label: 'review desk list', id: 'reviewDesk' },
  { key: 'src/views/sheets/SheetsView.vue', label: 'sheets list', id: 'sheets' },
  { key: 'src/views/parts/PartsShelfView.vue', label: 'parts shelf', id: 'parts' },
  { key: 'src/views/team/TeamView.vue', label: 'team list', id: 'team' },
  { key: 'src/views/outbox/OutboxView.vue', label: 'outbox list', id: 'outbox' },
];
const DESK = 'src/views/desk/DesignDeskView.vue';

function closure(manifest: Manifest, keys: string[]): Set<string> {
  const seen = new Set<string>();
  const visit = (k: string) => {
    if (seen.has(k) || !manifest[k]) return;
    seen.add(k);
    for (const i of manifest[k].imports ?? []) visit(i);
  };
  keys.forEach(visit);
  return seen;
}

function sizeOf(file: string, ext: '' | '.br' | '.gz'): number {
  const full = path.join(DIST, file + ext);
  if (fs.existsSync(full)) return fs.statSync(full).size;
  return fs.statSync(path.join(DIST, file)).size; // small files are not compressed
}

/** kB (1000 bytes) of the JS files of a page, as sent with brotli and with gzip. */
function pageJs(manifest: Manifest, keys: string[]): { br: number; gz: number; raw: number; files: string[] } {
  const files = [...closure(manifest, keys)].map((k) => manifest[k].file).filter((f) => f.endsWith('.js'));
  const sum = (ext: '' | '.br' | '.gz') => files.reduce((a, f) => a + sizeOf(f, ext), 0) / 1000;
  return { br: sum('.br'), gz: sum('.gz'), raw: sum(''), files };
}

/** Builds the client (production mode) and measures. */
export async function benchBundle(): Promise<Figure[]> {
  say('bundle: building the client…');
  const build = spawnSync(process.execPath, [path.join(ROOT_DIR, 'node_modules/vite/bin/vite.js'), 'build', '--logLevel', 'warn'], {
    cwd: ROOT_DIR,
    env: { ...process.env, NODE_ENV: 'production' },
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  if (build.status !== 0) throw new Error('vite build failed');
  const manifest = JSON.parse(fs.readFileSync(path.join(DIST, '.vite/manifest.json'), 'utf8')) as Manifest;
  const modules = JSON.parse(fs.readFileSync(path.join(DIST, '.vite/chunk-modules.json'), 'utf8')) as Record<string, string[]>;
  const entry = Object.keys(manifest).find((k) => manifest[k].isEntry)!;

  const heavy = (files: string[], test: RegExp) => files.filter((f) => (modules[f] ?? []).some((m) => test.test(m)));
  const figures: Figure[] = [];
  let listLoadsHeavy = 0;
  const heavyNotes: string[] = [];
  for (const page of PAGES) {
    // A page missing from the manifest (renamed or moved) would count as loading nothing: stop instead.
    if (!manifest[page.key]) throw new Error(`${page.key} is not in the Vite manifest; update PAGES in scripts/bench/bundle.ts`);
    const js = pageJs(manifest, [entry, page.key]);
    if (page.id === 'signIn' || page.id === 'designs')
      figures.push(
        atMost(
          `bundle.${page.id}.br`,
          `initial JS, ${page.label} (brotli)`,
          js.br,
          'kB',
          150,
          `${page.label}: ${js.files.length} JS files, ${js.br.toFixed(1)} kB brotli / ${js.gz.toFixed(1)} kB gzip / ${js.raw.toFixed(0)} kB raw`,
        ),
      );
    const engine = heavy(js.files, /^src\/engine\//);
    const mathjs = heavy(js.files, /node_modules\/mathjs\//);
    const plotly = heavy(js.files, /node_modules\/plotly/);
    // The plot component fetches plotly itself, on first use; a page that imports it is still a page with a plot.
    const plot = heavy(js.files, /^src\/components\/plots\//);
    if (engine.length || mathjs.length || plotly.length || plot.length) {
      listLoadsHeavy++;
      heavyNotes.push(`${page.label} loads ${[...new Set([...engine, ...mathjs, ...plotly, ...plot])].join(', ')}`);
    }
  }
  figures.push(
    atMost(
      'bundle.listHeavyChunks',
      'list pages loading engine/mathjs/plotly/plots',
      listLoadsHeavy,
      'pages',
      0,
      heavyNotes.join('; ') || `${PAGES.map((p) => p.label).join(', ')}: none of them`,
    ),
  );

  // The Design desk: its page, then a plot tab adds plotly; the engine runs in the worker file.
  const desk = pageJs(manifest, [entry, DESK]);
  const plotlyFiles = Object.keys(modules).filter((f) => modules[f].some((m) => /node_modules\/plotly/.test(m)));
  const deskStatic = heavy(desk.files, /node_modules\/plotly/);
  const worker = fs.readdirSync(path.join(DIST, 'assets')).filter((f) => /^engine\.worker-.*\.js$/.test(f));
  const plotTab = desk.br + [...plotlyFiles, ...worker.map((w) => `assets/${w}`)].reduce((a, f) => a + sizeOf(f, '.br'), 0) / 1000 + 0;
  figures.push(
    atMost(
      'bundle.deskStaticPlotly',
      'Design desk loading plotly before a plot tab',
      deskStatic.length,
      'chunks',
      0,
      'plotly is imported only by usePlotly()',
    ),
  );
  figures.push(
    info(
      'bundle.plotTab.br',
      'first visit of a plot tab, JS (brotli)',
      plotTab,
      'kB',
      'lower',
      `desk page ${desk.br.toFixed(0)} kB + plotly ${(plotlyFiles.reduce((a, f) => a + sizeOf(f, '.br'), 0) / 1000).toFixed(0)} kB + engine worker; ${(desk.raw + plotlyFiles.reduce((a, f) => a + sizeOf(f, ''), 0) / 1000).toFixed(0)} kB uncompressed`,
    ),
  );
  figures.push(...(await headerChecks(manifest, entry)));
  return figures;
}

/** Starts the app in this process (no database needed for static files) and checks the headers. */
async function headerChecks(manifest: Manifest, entry: string): Promise<Figure[]> {
  process.env.DB_PASSWORD ??= 'bench-only-password';
  process.env.JWT_SECRET ??= randomBytes(32).toString('base64url');
  process.env.LOG_LEVEL ??= 'silent';
  const { createApp } = await import('../../server/app');
  const server = createApp().listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
  const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  try {
    const asset = await fetch(`${base}/${manifest[entry].file}`, { headers: { 'Accept-Encoding': 'br, gzip' } });
    await asset.arrayBuffer();
    const page = await fetch(`${base}/designs`, { headers: { 'Accept-Encoding': 'br, gzip' } });
    await page.arrayBuffer();
    const problems: string[] = [];
    if (asset.headers.get('content-encoding') !== 'br') problems.push(`asset Content-Encoding ${asset.headers.get('content-encoding')}`);
    if (!/Accept-Encoding/i.test(asset.headers.get('vary') ?? '')) problems.push('asset lacks Vary: Accept-Encoding');
    if (asset.headers.get('cache-control') !== 'public, max-age=31536000, immutable')
      problems.push(`asset Cache-Control ${asset.headers.get('cache-control')}`);
    if (page.headers.get('cache-control') !== 'no-cache') problems.push(`index.html Cache-Control ${page.headers.get('cache-control')}`);
    // index.html is below the size worth compressing unless it grows; then it must go out compressed too.
    if (fs.existsSync(path.join(DIST, 'index.html.br')) && page.headers.get('content-encoding') !== 'br')
      problems.push(`index.html Content-Encoding ${page.headers.get('content-encoding')}`);
    return [
      atMost(
        'bundle.headerProblems',
        'compression and caching header problems',
        problems.length,
        '',
        0,
        problems.join('; ') || 'assets: br + Vary + immutable; index.html: br + no-cache',
      ),
    ];
  } finally {
    server.close();
  }
}
