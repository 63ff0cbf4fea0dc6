import bcrypt from 'bcryptjs';
import { Op } from 'sequelize';
import type { MigrationFn } from 'umzug';
import type { SeedContext } from '../migrator';
import { User } from '../models';
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from './demoAccounts';

// The five demo sign-ins. An account that already exists (e.g. created by hand) is left alone.
export const up: MigrationFn<SeedContext> = async () => {
  const passwordHash = await bcrypt.hash(DEMO_PASSWORD, 10);
  for (const account of DEMO_ACCOUNTS) {
    await User.findOrCreate({
      where: { email: account.email },
      defaults: { email: account.email, name: account.name, roles: account.roles, passwordHash, disabled: false },
    });
  }
};

export const down: MigrationFn<SeedContext> = async () => {
  await User.destroy({ where: { email: { [Op.in]: DEMO_ACCOUNTS.map((a) => a.email) } } });
};
