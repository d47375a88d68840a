import { Umzug, SequelizeStorage } from 'umzug';
import type { QueryInterface, Sequelize } from 'sequelize';
import path from 'node:path';
import { migrations } from './migrations';

export type MigrationContext = { queryInterface: QueryInterface; sequelize: Sequelize };

export function createMigrator(sequelize: Sequelize) {
  return new Umzug<MigrationContext>({
    // Migrations are listed in code so the same set runs under tsx, vitest and the Next server.
    migrations: migrations.map((m) => ({
      name: m.name,
      path: path.join('db/migrations', `${m.name}.ts`),
      up: ({ context }) => m.up(context),
      down: ({ context }) => m.down(context),
    })),
    context: { queryInterface: sequelize.getQueryInterface(), sequelize },
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  });
}
