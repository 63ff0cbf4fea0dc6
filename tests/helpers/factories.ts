import { createHash, randomBytes } from 'node:crypto';
import type { Express } from 'express';
import request from 'supertest';
import { getConfig } from '../../server/config';
import { getSequelize } from '../../server/db';
import { User, type Role, Design, Part, Revision, Sheet, type DesignStatus, type PartKind } from '../../server/models';
import { hashPassword } from '../../server/services/auth.service';
import { toPublicUser, type PublicUser } from '../../server/services/users.service';
import type { CaughtMessage } from '../../scripts/mailcatcher';
import { defaultDesign, parseDesign, type DesignInput, type DesignResult, type Mechanism } from '@/engine';
import { storeWithRows } from '../../server/services/fileStore.service';
import { computeStoredResults } from '../../server/services/designs.service';
import { freezeDesign } from '../../server/services/freezeRevision';

/** A supertest agent that keeps cookies between requests. */
export type Agent = ReturnType<typeof request.agent>;

/** The password factories give users unless told otherwise. */
export const DEFAULT_PASSWORD = 'test-password-42';

/** A fresh address on example.test, unique across parallel test files. */
export function uniqueEmail(prefix = 'user'): string {
  return `${prefix}-${randomBytes(6).toString('hex')}@example.test`;
}

/**
 * Creates a user row directly (no HTTP). Each test makes its own users.
 * @returns the public user plus the e-mail and password to sign in with.
 */
export async function createUser(
  options: { roles?: Role[]; disabled?: boolean; password?: string | null; name?: string; email?: string } = {},
): Promise<{ user: PublicUser; email: string; password: string }> {
  getSequelize();
  const email = options.email ?? uniqueEmail(options.roles?.[0] ?? 'nobody');
  const password = options.password === undefined ? DEFAULT_PASSWORD : options.password;
  const row = await User.create({
    email,
    name: options.name ?? `Test ${email.split('@')[0]}`,
    roles: options.roles ?? [],
    disabled: options.disabled ?? false,
    passwordHash: password === null ? null : await hashPassword(password),
  });
  return { user: toPublicUser(row), email, password: password ?? '' };
}

/** Signs in through the API and returns an agent carrying the session cookie. Throws if sign-in fails. */
export async function signIn(app: Express, email: string, password: string): Promise<Agent> {
  const agent = request.agent(app);
  const res = await agent.post('/api/auth/login').send({ email, password });
  if (res.status !== 200) throw new Error(`signIn(${email}) failed: ${res.status} ${JSON.stringify(res.body)}`);
  return agent;
}

/** Creates a user with `roles` and returns a signed-in agent for them. */
export async function signedInAs(
  app: Express,
  roles: Role[],
): Promise<{ agent: Agent; user: PublicUser; email: string; password: string }> {
  const created = await createUser({ roles });
  return { ...created, agent: await signIn(app, created.email, created.password) };
}

function catcherUrl(): string {
  const config = getConfig();
  return `http://${config.smtp.host}:${config.mailcatcherHttpPort}/messages`;
}

/** Reads the mail the test mail catcher received, optionally only that to one address. */
export async function fetchOutbox(to?: string): Promise<CaughtMessage[]> {
  const res = await fetch(to ? `${catcherUrl()}?to=${encodeURIComponent(to)}` : catcherUrl());
  if (!res.ok) throw new Error(`mail catcher answered ${res.status}`);
  return (await res.json()) as CaughtMessage[];
}

/**
 * Waits until a mail to `to` (whose subject contains `subject`, if given) has arrived and returns it.
 * Mail is sent in the background after the HTTP answer, so tests poll briefly instead of sleeping.
 */
export async function waitForMail(to: string, subject?: string, timeoutMs = 10_000): Promise<CaughtMessage> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const found = (await fetchOutbox(to)).find((m) => !subject || m.subject.includes(subject));
    if (found) return found;
    if (Date.now() > deadline) throw new Error(`No mail to ${to}${subject ? ` with subject "${subject}"` : ''} within ${timeoutMs} ms.`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

/** The `token` query parameter of the first APP_URL/reset link in a mail's text. */
export function tokenFromMail(message: CaughtMessage): string {
  const match = /\/reset\?token=([A-Za-z0-9_%-]+)/.exec(message.text);
  if (!match) throw new Error(`No reset link in mail "${message.subject}".`);
  return decodeURIComponent(match[1]);
}

/**
 * Creates a design row directly (no HTTP) from the engine's template for `mechanism`, with `edit` applied to
 * the document, stored travel and summary computed as the API does. `status` lets a test put it in any state.
 */
export async function createDesign(options: {
  owner: PublicUser;
  name?: string;
  mechanism?: Mechanism;
  status?: DesignStatus;
  edit?: (doc: DesignInput) => DesignInput;
}): Promise<{ id: number; name: string; version: number; inputs: DesignInput }> {
  getSequelize();
  const base = defaultDesign(options.mechanism ?? 'corexy');
  const named = { ...base, name: options.name ?? `Design ${randomBytes(4).toString('hex')}` };
  const inputs = parseDesign(options.edit ? options.edit(named) : named);
  const row = await Design.create({
    name: inputs.name,
    mechanism: inputs.mechanism,
    status: options.status ?? 'draft',
    ownerId: options.owner.id,
    updatedById: options.owner.id,
    inputs: inputs as unknown as Record<string, unknown>,
    ...computeStoredResults(inputs),
    version: 1,
  });
  return { id: row.id, name: row.name, version: row.version, inputs };
}

/** Creates a part row directly (no HTTP); `fields` override a valid default of that kind. */
export async function createPart(kind: PartKind, fields: Record<string, unknown> = {}): Promise<{ id: number; name: string }> {
  getSequelize();
  const defaults: Record<PartKind, Record<string, unknown>> = {
    belt: {
      profile: '2 mm round tooth',
      standard: 'common practice',
      pitchMm: 2,
      widthMm: 6,
      linearMassKgPerM: 0.0075,
      axialStiffnessN: 40000,
      allowableTensionN: 250,
      minPulleyTeeth: 12,
      source: 'test',
    },
    pulley: { teeth: 20, pitchMm: 2, profile: '2 mm round tooth', kind: 'drive', boreMm: 5, inertiaKgM2: null },
    motor: {
      frameMm: 42,
      stepAngleDeg: 1.8,
      holdingTorqueNm: 0.45,
      ratedCurrentA: 1.5,
      phaseResistanceOhm: 1.8,
      phaseInductanceMh: 3.2,
      rotorInertiaKgM2: 5.7e-6,
      massKg: 0.28,
      torqueCurve: null,
    },
  };
  const { name, note, retired, ...data } = { ...defaults[kind], ...fields } as Record<string, unknown>;
  const row = await Part.create({
    kind,
    name: String(name ?? `Test ${kind} ${randomBytes(4).toString('hex')}`),
    note: String(note ?? ''),
    retired: Boolean(retired),
    data,
    createdById: null,
    updatedById: null,
  });
  return { id: row.id, name: row.name };
}

/**
 * Creates an approved design with a frozen revision and its sheet directly (no HTTP, no PDF rendering: the sheet
 * rows carry a tiny placeholder instead of the rendered bytes). For tests of what hangs off a sheet (measurements).
 * @returns the ids and the frozen inputs and result the sheet stands for
 */
export async function createApprovedSheet(options: {
  owner: PublicUser;
  approver: PublicUser;
  mechanism?: Mechanism;
  edit?: (doc: DesignInput) => DesignInput;
  /** The SHA-256 recorded for the A4 file instead of the real one (a sheet whose bytes were swapped later). */
  recordedA4Sha256?: string;
  /**
   * Keep the PDFs in the content store, as approvals do now (bytes unique to this sheet); by default they stay in the
   * row, as for sheets published before sheets moved to the store.
   */
  inContentStore?: boolean;
}): Promise<{ sheetId: number; designId: number; revisionId: number; inputs: DesignInput; result: DesignResult }> {
  getSequelize();
  const design = await createDesign({ owner: options.owner, mechanism: options.mechanism, status: 'approved', edit: options.edit });
  const frozen = freezeDesign(design.inputs);
  const now = new Date();
  const revision = await Revision.create({
    designId: design.id,
    number: 1,
    status: 'approved',
    inputs: frozen.inputs as unknown as Record<string, unknown>,
    result: frozen.result as unknown as Record<string, unknown>,
    summary: frozen.summary,
    engineVersion: frozen.result.engineVersion,
    fingerprint: frozen.fingerprint,
    authorId: options.owner.id,
    submittedAt: now,
    decidedById: options.approver.id,
    decidedAt: now,
    decisionNote: 'Approved in a test.',
  });
  const placeholder = options.inContentStore
    ? Buffer.from(`%PDF-1.4\n% placeholder sheet of an API test ${randomBytes(8).toString('hex')}\n%%EOF\n`)
    : Buffer.from('%PDF-1.4\n% placeholder sheet of an API test\n%%EOF\n');
  const hash = createHash('sha256').update(placeholder).digest('hex');
  const row = {
    revisionId: revision.id,
    designId: design.id,
    approvedById: options.approver.id,
    approvedAt: now,
    comment: 'Approved in a test.',
    a4Pdf: options.inContentStore ? null : placeholder,
    a4Sha256: options.recordedA4Sha256 ?? hash,
    a4Size: placeholder.length,
    letterPdf: options.inContentStore ? null : placeholder,
    letterSha256: hash,
    letterSize: placeholder.length,
  };
  const sheet = options.inContentStore
    ? await storeWithRows(placeholder, (transaction) => Sheet.create(row, { transaction }))
    : await Sheet.create(row);
  return { sheetId: sheet.id, designId: design.id, revisionId: revision.id, inputs: frozen.inputs, result: frozen.result };
}
