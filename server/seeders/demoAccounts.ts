import type { Role } from '../models';

/** The password of every demo account (README, `npm start` output, e2e tests). */
export const DEMO_PASSWORD = 'gantry-demo';

/** The invented workshop the demo data belongs to. */
export const DEMO_WORKSHOP = 'Larchmont Gantry Studio';

/** The fixed demo sign-ins. Later demo seeders look these users up by e-mail. */
export const DEMO_ACCOUNTS: ReadonlyArray<{ email: string; name: string; roles: Role[] }> = [
  { email: 'admin@example.test', name: 'Oriel Vantongeren', roles: ['admin'] },
  { email: 'designer@example.test', name: 'Maren Quillfeather', roles: ['designer'] },
  { email: 'designer2@example.test', name: 'Tobiah Renwick', roles: ['designer'] },
  { email: 'reviewer@example.test', name: 'Sunniva Halloran', roles: ['reviewer'] },
  { email: 'maker@example.test', name: 'Dorian Keswick', roles: ['maker'] },
];

/** Lines for the console: e-mail, roles and the shared password. */
export function formatDemoSignIns(): string {
  const width = Math.max(...DEMO_ACCOUNTS.map((a) => a.email.length));
  const rows = DEMO_ACCOUNTS.map((a) => `  ${a.email.padEnd(width)}  ${a.roles.join(', ')}`);
  return [`Demo sign-ins (${DEMO_WORKSHOP}), password "${DEMO_PASSWORD}" for all:`, ...rows].join('\n');
}
