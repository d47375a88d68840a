import { Sequelize } from 'sequelize';
import pg from 'pg';
import { appDatabaseUrl, databaseUrl } from './config';

// Keep one pool per process even when Next reloads modules in development.
const globalForDb = globalThis as unknown as { bandconeSequelize?: Sequelize; bandconeOwnerSequelize?: Sequelize };

function connect(url: string): Sequelize {
  return new Sequelize(url, {
    dialect: 'postgres',
    dialectModule: pg,
    logging: process.env.DB_LOG === '1' ? console.log : false,
    // When PostgreSQL is down or restarting, a request fails within seconds (a 503) instead of waiting a minute for a connection.
    pool: { max: Number(process.env.DB_POOL_MAX ?? 10), min: 0, idle: 10_000, acquire: 5_000, evict: 1_000 },
    dialectOptions: { connectionTimeoutMillis: 3_000 },
    retry: { max: 1 },
    define: { underscored: true },
  });
}

/** The pool for ordinary work: the app role (APP_DATABASE_URL) when set, else the owner. */
export function getSequelize(): Sequelize {
  globalForDb.bandconeSequelize ??= connect(appDatabaseUrl());
  return globalForDb.bandconeSequelize;
}

/** The owner's pool (DATABASE_URL), for migrations: only the owner changes the schema. */
export function getOwnerSequelize(): Sequelize {
  globalForDb.bandconeOwnerSequelize ??= connect(databaseUrl());
  return globalForDb.bandconeOwnerSequelize;
}

export async function closeSequelize(): Promise<void> {
  const pools = [globalForDb.bandconeSequelize, globalForDb.bandconeOwnerSequelize];
  globalForDb.bandconeSequelize = undefined;
  globalForDb.bandconeOwnerSequelize = undefined;
  for (const pool of pools) await pool?.close();
}
