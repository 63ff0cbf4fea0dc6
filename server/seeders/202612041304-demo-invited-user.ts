import type { MigrationFn } from 'umzug';
import type { SeedContext } from '../migrator';
import { AuditLog, User } from '../models';

// Someone invited who has not set a password yet, so the Team screen shows an invitation still open ("Invited — no
// password yet"), not an active account. No sign-in: the invitation link went to a mailbox nobody reads.
const EMAIL = 'pim.newcomer@example.test';

export const up: MigrationFn<SeedContext> = async ({ context }) => {
  if (await User.findOne({ where: { email: EMAIL } })) return;
  const admin = await User.findOne({ where: { email: 'admin@example.test' } });
  await context.sequelize.transaction(async (transaction) => {
    const user = await User.create(
      { email: EMAIL, name: 'Pim Newcomer', roles: ['maker'], passwordHash: null, disabled: false },
      { transaction },
    );
    await AuditLog.create(
      {
        actorId: admin?.id ?? null,
        action: 'user.invite',
        entity: 'user',
        entityId: user.id,
        fromState: null,
        toState: 'invited',
        reason: null,
      },
      { transaction },
    );
  });
};

export const down: MigrationFn<SeedContext> = async () => {
  await User.destroy({ where: { email: EMAIL } });
};
