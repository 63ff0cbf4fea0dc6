// Sequelize keeps its constructor options on the instance (`sequelize.options`) but its type declarations do not say
// so; the database tests read and swap them (query logging, replication, the failover driver).
import type { Options } from 'sequelize';

declare module 'sequelize' {
  interface Sequelize {
    options: Options;
  }
}
