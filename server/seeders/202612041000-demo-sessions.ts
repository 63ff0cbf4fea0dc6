import { randomBytes } from 'node:crypto';
import type { MigrationFn } from 'umzug';
import type { SeedContext } from '../migrator';
import { Session, User } from '../models';
import { hashSessionId } from '../services/session.service';

// Earlier sign-ins of the demo designer on other devices, so the user menu's "Active sessions" shows what it is for:
// signing out a device one does not recognise. The ids are random and thrown away, so no cookie can ever match these
// rows; they expire a week after seeding. Addresses are from the documentation ranges (RFC 5737).
const DEVICES = [
  { userAgent: 'Firefox on Linux', ip: '192.0.2.41', hoursAgo: 20 },
  { userAgent: 'Safari on iOS', ip: '198.51.100.7', hoursAgo: 3 },
];
const DEMO_EMAIL = 'designer@example.test';

export const up: MigrationFn<SeedContext> = async () => {
  const designer = await User.findOne({ where: { email: DEMO_EMAIL } });
  if (!designer) return;
  const now = Date.now();
  for (const device of DEVICES) {
    const signedIn = new Date(now - device.hoursAgo * 3600_000);
    await Session.create({
      tokenHash: hashSessionId(randomBytes(32).toString('base64url')),
      userId: designer.id,
      createdAt: signedIn,
      lastSeenAt: new Date(signedIn.getTime() + 40 * 60_000),
      expiresAt: new Date(now + 7 * 24 * 3600_000),
      revokedAt: null,
      revokedReason: null,
      userAgent: device.userAgent,
      ip: device.ip,
    });
  }
};

export const down: MigrationFn<SeedContext> = async () => {
  const designer = await User.findOne({ where: { email: DEMO_EMAIL } });
  if (designer) await Session.destroy({ where: { userId: designer.id, ip: DEVICES.map((d) => d.ip) } });
};
