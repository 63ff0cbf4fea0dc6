import { createHash } from 'node:crypto';
import { syntheticPluckWav } from '../../server/seeders/202612020301-demo-uploads';
import type { ScaleClient } from './client';

/**
 * What the simulated users did and were told: every write the app acknowledged (2xx) and every write that got no
 * definite answer (no response, or a 5xx), so the checks after the run can prove that each acknowledged write is
 * present exactly once and each unanswered one at most once.
 */
export type Ledger = {
  designs: Array<{ id: number; name: string }>;
  saves: Array<{ designId: number; version: number }>;
  submits: Array<{ designId: number; revisionId: number; number: number }>;
  approvals: Array<{ revisionId: number; sheetId: number; a4Sha256: string; letterSha256: string }>;
  downloads: Array<{ sheetId: number; expected: string; actual: string }>;
  measurements: Array<{ sheetId: number; id: number; recordingSha256: string }>;
  /** Writes without a definite answer: `kind` and the unique mark that finds them afterwards. */
  unanswered: Array<{ kind: 'design' | 'save' | 'submit' | 'approve' | 'measurement'; mark: string }>;
  /** Journeys abandoned after an error, by the step that failed. */
  abandoned: Record<string, number>;
};

export function emptyLedger(): Ledger {
  return { designs: [], saves: [], submits: [], approvals: [], downloads: [], measurements: [], unanswered: [], abandoned: {} };
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
const MECHANISMS = ['corexy', 'hbot', 'cartesian'] as const;
const sha256 = (bytes: Buffer) => createHash('sha256').update(bytes).digest('hex');
/** No definite answer: the write may or may not have happened. */
const isUnanswered = (status: number) => status === 0 || status >= 500;

type DesignDetail = { id: number; version: number; name: string; inputs: Record<string, unknown> & { pretensionN: number } };
type SheetDetail = {
  id: number;
  sha256: string;
  files: Array<{ paper: string; sha256: string }>;
  build: { belts: Array<{ spans: Array<{ id: string; targetFrequencyHz: number; fixedLength: boolean }> }> };
};

/** The three people of one simulated user's journey: the designer is its own, reviewer and maker are shared. */
export type Crew = { designer: ScaleClient; reviewer: ScaleClient; maker: ScaleClient };

/** Unique seeds for the synthetic recordings (distinct bytes, so each upload is its own content). */
let recordingSeed = 1000;

class Abandon extends Error {
  constructor(readonly step: string) {
    super(step);
  }
}

/**
 * One journey through the product, as a team would walk it: the designer lists designs, starts one from a template,
 * looks at live results, saves twice (autosave with the optimistic lock), submits it; a reviewer approves it, which
 * renders the design sheet; a maker opens the sheet, downloads its PDF (checked against its SHA-256) and uploads a
 * pluck recording of one belt span. Returns when done; throws Abandon (caught by the caller) after a failed step.
 */
export async function runJourney(crew: Crew, ledger: Ledger, options: { tag: string; thinkMs: [number, number] }): Promise<void> {
  const think = () => sleep(options.thinkMs[0] + Math.random() * (options.thinkMs[1] - options.thinkMs[0]));
  const { designer, reviewer, maker } = crew;

  await designer.get('/api/designs?page=1&pageSize=20');
  await think();

  const name = `${options.tag} ${Math.random().toString(36).slice(2, 10)}`;
  const created = await designer.post<DesignDetail>('/api/designs', { template: MECHANISMS[Math.floor(Math.random() * 3)], name });
  if (created.status !== 201) {
    if (isUnanswered(created.status)) ledger.unanswered.push({ kind: 'design', mark: name });
    throw new Abandon('create');
  }
  ledger.designs.push({ id: created.body.id, name });
  let design = created.body;
  await think();

  await designer.post('/api/calc', { design: design.inputs });
  await think();

  for (let save = 0; save < 2; save += 1) {
    const inputs = { ...design.inputs, pretensionN: Math.round((design.inputs.pretensionN + 0.5 + save) * 10) / 10 };
    const res = await designer.patch<DesignDetail>(`/api/designs/${design.id}`, { inputs, version: design.version });
    if (res.status !== 200) {
      if (isUnanswered(res.status)) ledger.unanswered.push({ kind: 'save', mark: `${design.id}:${design.version + 1}` });
      throw new Abandon('save');
    }
    ledger.saves.push({ designId: design.id, version: res.body.version });
    design = res.body;
    await think();
  }

  const submitted = await designer.post<{ id: number; number: number }>(`/api/designs/${design.id}/submit`, { version: design.version });
  if (submitted.status !== 201) {
    if (isUnanswered(submitted.status)) ledger.unanswered.push({ kind: 'submit', mark: String(design.id) });
    throw new Abandon('submit');
  }
  ledger.submits.push({ designId: design.id, revisionId: submitted.body.id, number: submitted.body.number });
  await think();

  await reviewer.get('/api/revisions?status=in_review&page=1&pageSize=10');
  await think();
  const approved = await reviewer.post<{ sheet: SheetDetail }>(`/api/revisions/${submitted.body.id}/approve`, {
    comment: `Checked under load (${options.tag}).`,
  });
  if (approved.status !== 200) {
    if (isUnanswered(approved.status)) ledger.unanswered.push({ kind: 'approve', mark: String(submitted.body.id) });
    throw new Abandon('approve');
  }
  const sheet = approved.body.sheet;
  ledger.approvals.push({
    revisionId: submitted.body.id,
    sheetId: sheet.id,
    a4Sha256: sheet.files.find((f) => f.paper === 'A4')?.sha256 ?? sheet.sha256,
    letterSha256: sheet.files.find((f) => f.paper === 'LETTER')?.sha256 ?? '',
  });
  await think();

  const opened = await maker.get<SheetDetail>(`/api/sheets/${sheet.id}`);
  if (opened.status !== 200) throw new Abandon('open sheet');
  const pdf = await maker.get(`/api/sheets/${sheet.id}/pdf`, { binary: true });
  if (pdf.status !== 200 || !pdf.bytes) throw new Abandon('download');
  ledger.downloads.push({ sheetId: sheet.id, expected: opened.body.sha256, actual: sha256(pdf.bytes) });
  await think();

  const spans = opened.body.build.belts.flatMap((b) => b.spans);
  const span = spans.find((s) => !s.fixedLength && s.targetFrequencyHz > 20) ?? spans[0];
  const wav = syntheticPluckWav(span.targetFrequencyHz, (recordingSeed += 1));
  const form = new FormData();
  form.set('spanId', span.id);
  form.set('file', new Blob([new Uint8Array(wav)], { type: 'audio/wav' }), 'pluck.wav');
  const measured = await maker.upload<{ id: number; recording: { sha256: string } | null }>(`/api/sheets/${sheet.id}/measurements`, form);
  if (measured.status !== 201) {
    if (isUnanswered(measured.status)) ledger.unanswered.push({ kind: 'measurement', mark: sha256(wav) });
    throw new Abandon('pluck upload');
  }
  ledger.measurements.push({ sheetId: sheet.id, id: measured.body.id, recordingSha256: measured.body.recording?.sha256 ?? '' });
  await think();
  await maker.get(`/api/sheets/${sheet.id}/measurements`);
}

/** The failed step of an abandoned journey, or null for any other error (a bug of the scale test itself). */
export function abandonedStep(err: unknown): string | null {
  return err instanceof Abandon ? err.step : null;
}

/** What the editors of one shared design were told. */
export type ContentionLedger = {
  designId: number;
  initialVersion: number;
  acks: Array<{ version: number; name: string; writer: number }>;
  conflicts: number;
  unanswered: Array<{ name: string }>;
};

/**
 * One of several editors saving the same design at once through different app processes (and so through different
 * database nodes), each with the version it just read: the optimistic lock must let exactly one save per version win.
 */
export async function runEditor(
  client: ScaleClient,
  fallback: ScaleClient,
  writer: number,
  ledger: ContentionLedger,
  shouldStop: () => boolean,
): Promise<void> {
  let seq = 0;
  while (!shouldStop()) {
    let current = await client.get<DesignDetail>(`/api/designs/${ledger.designId}`, { route: '/api/designs/:id (editor)' });
    let via = client;
    if (current.status === 0) {
      current = await fallback.get<DesignDetail>(`/api/designs/${ledger.designId}`, { route: '/api/designs/:id (editor)' });
      via = fallback;
    }
    if (current.status !== 200) {
      await sleep(500);
      continue;
    }
    seq += 1;
    const name = `Shared stage w${writer} n${seq}`;
    const res = await via.patch<DesignDetail>(
      `/api/designs/${ledger.designId}`,
      { name, version: current.body.version },
      { route: '/api/designs/:id (editor save)' },
    );
    if (res.status === 200) ledger.acks.push({ version: res.body.version, name, writer });
    else if (res.status === 409 && res.code === 'version_conflict') ledger.conflicts += 1;
    else if (isUnanswered(res.status)) ledger.unanswered.push({ name });
    await sleep(40 + Math.random() * 120);
  }
}
