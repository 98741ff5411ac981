import { readdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { Umzug, SequelizeStorage } from 'umzug';
import type { QueryInterface, Sequelize } from 'sequelize';

export const MIGRATIONS_DIR = resolve(import.meta.dirname, '..', '..', 'migrations');

export interface MigrationContext {
  queryInterface: QueryInterface;
  sequelize: Sequelize;
}

export interface Migration {
  up(context: { queryInterface: QueryInterface; sequelize: Sequelize }): Promise<void>;
  down(context: { queryInterface: QueryInterface; sequelize: Sequelize }): Promise<void>;
}

/** umzug over the files in services/api/migrations, in name order (YYYYMMDDHHmm-verb-noun.ts). */
export function createMigrator(sequelize: Sequelize, log = false): Umzug<MigrationContext> {
  const files = readdirSync(MIGRATIONS_DIR)
    .filter((f) => /^\d{12}-[a-z0-9-]+\.ts$/.test(f))
    .sort();
  return new Umzug<MigrationContext>({
    migrations: files.map((file) => ({
      name: file.replace(/\.ts$/, ''),
      up: async ({ context }: { context: MigrationContext }) => ((await import(pathToFileURL(join(MIGRATIONS_DIR, file)).href)) as Migration).up(context),
      down: async ({ context }: { context: MigrationContext }) => ((await import(pathToFileURL(join(MIGRATIONS_DIR, file)).href)) as Migration).down(context),
    })),
    context: { queryInterface: sequelize.getQueryInterface(), sequelize },
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: log ? console : undefined,
  });
}
