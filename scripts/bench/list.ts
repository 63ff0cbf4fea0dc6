import { ROOT_DIR } from '../../server/paths';
import { BENCH_DB_MANY, BENCH_PORTS, benchEnv, Client, startApp } from './env';
import { atMost, info, median, say, type Figure } from './lib';
import { ensureManyDesigns } from './seed';

/**
 * List part of `npm run bench`: the Designs list API on a database of 10,000 designs (seeded once with the same
 * code as `npm run seed:many`). Every sort the table offers, both directions, first and a deep page; the filters
 * with the default sort and with every sort; and a search typed letter by letter. Requests are interleaved over rounds so that every
 * variant sees the same machine; figures are medians and ratios against the default sort in the same run.
 */
const DESIGNS = 10_000;
const ROUNDS = Number(process.env.BENCH_LIST_ROUNDS ?? 15);
const SORTS = ['name', 'updatedAt', 'status', 'mechanism', 'owner', 'createdAt'];
const DEFAULT = '/api/designs?sort=-updatedAt&pageSize=25';
const TYPED = 'dispensing st';

export async function benchList(): Promise<Figure[]> {
  await benchEnv();
  await ensureManyDesigns(BENCH_DB_MANY, DESIGNS);
  const app = await startApp({ cwd: ROOT_DIR, port: BENCH_PORTS.app + 3, database: BENCH_DB_MANY, label: 'list app' });
  const client = new Client(app.url);
  try {
    await client.signIn('designer@example.test');
    const variants = new Map<string, string>([['default', DEFAULT]]);
    for (const sort of SORTS)
      for (const dir of ['', '-']) {
        variants.set(`sort ${dir}${sort}`, `/api/designs?sort=${dir}${sort}&pageSize=25`);
        variants.set(`sort ${dir}${sort}, page 200`, `/api/designs?sort=${dir}${sort}&pageSize=25&page=200`);
      }
    // Every filter with the default sort, then with every other sort both ways (the table combines them freely).
    const FILTERS = ['status=draft', 'mechanism=hbot', 'owner=me'];
    for (const filter of FILTERS) {
      variants.set(`filter ${filter}`, `${DEFAULT}&${filter}`);
      for (const sort of SORTS)
        for (const dir of ['', '-'])
          if (`${dir}${sort}` !== '-updatedAt')
            variants.set(`filter ${filter}, sort ${dir}${sort}`, `/api/designs?sort=${dir}${sort}&pageSize=25&${filter}`);
    }
    for (let i = 1; i <= TYPED.length; i++)
      variants.set(`search "${TYPED.slice(0, i)}"`, `${DEFAULT}&q=${encodeURIComponent(TYPED.slice(0, i))}`);

    const times = new Map<string, number[]>([...variants.keys()].map((k) => [k, []]));
    const totals = new Map<string, number>();
    // Warm-up round (connection pool, query cache of the server's own code), not counted.
    for (const url of variants.values()) await client.request('GET', url);
    for (let round = 0; round < ROUNDS; round++) {
      for (const [name, url] of variants) {
        const res = await client.request('GET', url);
        if (res.status !== 200) throw new Error(`${url} answered ${res.status}: ${res.body.slice(0, 200)}`);
        times.get(name)!.push(res.ms);
        totals.set(name, (JSON.parse(res.body) as { total: number }).total);
      }
    }
    const m = (name: string) => median(times.get(name)!);
    const base = m('default');
    const ratioOf = (prefix: string) =>
      [...times.keys()]
        .filter((k) => k.startsWith(prefix))
        .map((k) => ({ k, r: m(k) / base }))
        .sort((a, b) => b.r - a.r);
    const sorts = ratioOf('sort ');
    const filters = ratioOf('filter ');
    const searches = ratioOf('search ');
    say(`list: default ${base.toFixed(1)} ms; ${[...times.keys()].map((k) => `${k} ${m(k).toFixed(1)}`).join('; ')}`);
    return [
      info(
        'list.default.median',
        `Designs list, ${DESIGNS.toLocaleString('en-GB')} designs, default sort (median)`,
        base,
        'ms',
        'lower',
        `${totals.get('default')} designs counted per page`,
      ),
      atMost(
        'list.sort.ratio',
        'slowest sort ÷ default sort (same run)',
        sorts[0].r,
        '×',
        2,
        `slowest: ${sorts[0].k} (${m(sorts[0].k).toFixed(1)} ms); every sort both ways, first page and page 200`,
      ),
      atMost(
        'list.filter.ratio',
        'slowest filter ÷ default sort',
        filters[0].r,
        '×',
        2,
        `slowest: ${filters[0].k} (${m(filters[0].k).toFixed(1)} ms)`,
      ),
      atMost(
        'list.search.ratio',
        `slowest search keystroke ÷ default sort ("${TYPED}" typed)`,
        searches[0].r,
        '×',
        2,
        `slowest: ${searches[0].k} (${m(searches[0].k).toFixed(1)} ms, ${totals.get(searches[0].k)} found)`,
      ),
    ];
  } finally {
    client.close();
    await app.stop();
  }
}
