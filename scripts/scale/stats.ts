import type { RequestRecord } from './client';

/** A stretch of the run with one situation (all up, an app process down, a database node rejoining…). */
export type Phase = { name: string; start: number; end: number };

/** What one phase measured. */
export type PhaseStats = {
  name: string;
  seconds: number;
  requests: number;
  perSecond: number;
  journeys: number;
  p50Ms: number;
  p99Ms: number;
  maxMs: number;
  errors: number;
  /** Errors by kind: "502", "503 db_unavailable", "0 ECONNREFUSED"… */
  errorKinds: Record<string, number>;
  /** Requests answered per app process. */
  servedBy: Record<string, number>;
};

/** The value below which `q` (0–1) of the sorted values lie (nearest rank). */
export function percentile(sorted: number[], q: number): number {
  if (!sorted.length) return 0;
  const rank = Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1));
  return sorted[rank];
}

/**
 * An answer that counts as an error of the service: no answer, a 5xx, or a 409 `write_conflict` (a conflict the
 * retries could not resolve). Expected answers (a 409 version conflict of two editors, 4xx of the probes) are not.
 */
export function isError(r: RequestRecord): boolean {
  return r.status === 0 || r.status >= 500 || (r.status === 409 && r.code === 'write_conflict');
}

/**
 * Splits the requests and completed journeys into phases by when they ENDED (a request cut off by a kill belongs to
 * the phase of the kill, not to the calm before it) and measures each.
 */
export function phaseStats(phases: Phase[], requests: RequestRecord[], journeyEnds: number[]): PhaseStats[] {
  return phases.map((phase, index) => {
    // The last phase also takes what finished after the load was stopped (the journeys that were still running).
    const isLast = index === phases.length - 1;
    const inPhase = requests.filter((r) => r.at + r.ms >= phase.start && (r.at + r.ms < phase.end || isLast));
    const ok = inPhase
      .filter((r) => !isError(r))
      .map((r) => r.ms)
      .sort((a, b) => a - b);
    const seconds = Math.max(0.001, (phase.end - phase.start) / 1000);
    const errorKinds: Record<string, number> = {};
    const servedBy: Record<string, number> = {};
    for (const r of inPhase) {
      if (isError(r)) {
        const kind = `${r.status}${r.code ? ` ${r.code}` : ''}`;
        errorKinds[kind] = (errorKinds[kind] ?? 0) + 1;
      }
      if (r.servedBy) servedBy[r.servedBy] = (servedBy[r.servedBy] ?? 0) + 1;
    }
    return {
      name: phase.name,
      seconds: Math.round(seconds * 10) / 10,
      requests: inPhase.length,
      perSecond: Math.round((inPhase.length / seconds) * 10) / 10,
      journeys: journeyEnds.filter((t) => t >= phase.start && (t < phase.end || isLast)).length,
      p50Ms: percentile(ok, 0.5),
      p99Ms: percentile(ok, 0.99),
      maxMs: ok.length ? ok[ok.length - 1] : 0,
      errors: inPhase.filter(isError).length,
      errorKinds,
      servedBy,
    };
  });
}

/** A plain-text table (left-aligned first column, the rest right-aligned). */
export function table(header: string[], rows: Array<Array<string | number>>): string {
  const cells = [header, ...rows.map((r) => r.map(String))];
  const widths = header.map((_, i) => Math.max(...cells.map((r) => (r[i] ?? '').length)));
  const line = (r: string[]) => r.map((c, i) => (i === 0 ? c.padEnd(widths[i]) : c.padStart(widths[i]))).join('  ');
  return [line(cells[0]), widths.map((w) => '-'.repeat(w)).join('  '), ...cells.slice(1).map(line)].join('\n');
}

/** Latency of each kind of request over the whole run (answered ones), slowest p99 first. */
export function routeStats(
  requests: RequestRecord[],
): Array<{ route: string; requests: number; p50Ms: number; p99Ms: number; errors: number }> {
  const byRoute = new Map<string, RequestRecord[]>();
  for (const r of requests) byRoute.set(`${r.method} ${r.route}`, [...(byRoute.get(`${r.method} ${r.route}`) ?? []), r]);
  return [...byRoute.entries()]
    .map(([route, list]) => {
      const ok = list
        .filter((r) => !isError(r))
        .map((r) => r.ms)
        .sort((a, b) => a - b);
      return { route, requests: list.length, p50Ms: percentile(ok, 0.5), p99Ms: percentile(ok, 0.99), errors: list.filter(isError).length };
    })
    .sort((a, b) => b.p99Ms - a.p99Ms);
}
