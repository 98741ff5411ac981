import { Sequelize, type Transaction } from 'sequelize';
import { databaseUrl, type Settings } from '@localis/shared';
import { initModels, type Models } from './models';

export interface Database {
  sequelize: Sequelize;
  models: Models;
  /** Run `work` in one transaction: all of it is written, or none. */
  transaction<T>(work: (tx: Transaction) => Promise<T>): Promise<T>;
  close(): Promise<void>;
}

export function openDatabase(s: Settings, options: { poolMax?: number } = {}): Database {
  const sequelize = new Sequelize(databaseUrl(s), {
    dialect: 'postgres',
    logging: false,
    pool: { max: options.poolMax ?? 10, min: 0, idle: 10_000 },
    define: { underscored: true },
  });
  const models = initModels(sequelize);
  return {
    sequelize,
    models,
    transaction: (work) => sequelize.transaction((tx) => work(tx)),
    close: () => sequelize.close(),
  };
}
