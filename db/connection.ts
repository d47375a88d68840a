import { Sequelize } from 'sequelize';
import pg from 'pg';
import { appDatabaseUrl, databaseUrl, replicaDatabaseUrl } from './config';

// Keep one pool per process even when Next reloads modules in development.
const globalForDb = globalThis as unknown as { bandconeSequelize?: Sequelize; bandconeOwnerSequelize?: Sequelize; bandconeReplicaSequelize?: Sequelize };

function connect(url: string, timeouts = { acquire: 5_000, connect: 3_000 }): Sequelize {
  return new Sequelize(url, {
    dialect: 'postgres',
    dialectModule: pg,
    logging: process.env.DB_LOG === '1' ? console.log : false,
    // When PostgreSQL is down or restarting, a request fails within seconds (a 503) instead of waiting a minute for a connection.
    pool: { max: Number(process.env.DB_POOL_MAX ?? 10), min: 0, idle: 10_000, acquire: timeouts.acquire, evict: 1_000 },
    dialectOptions: { connectionTimeoutMillis: timeouts.connect },
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

/**
 * The read-only pool on the streaming replica (DATABASE_REPLICA_URL), or null without one.
 * Its timeouts are short: a replica that does not answer within a second is treated as down
 * and the read goes to the primary (db/replica.ts), so no request waits on it.
 */
export function getReplicaSequelize(): Sequelize | null {
  const url = replicaDatabaseUrl();
  if (!url) return null;
  const connectMs = Number(process.env.DB_REPLICA_CONNECT_TIMEOUT_MS ?? 1_000);
  globalForDb.bandconeReplicaSequelize ??= connect(url, { acquire: 2 * connectMs, connect: connectMs });
  return globalForDb.bandconeReplicaSequelize;
}

export async function closeSequelize(): Promise<void> {
  const pools = [globalForDb.bandconeSequelize, globalForDb.bandconeOwnerSequelize, globalForDb.bandconeReplicaSequelize];
  globalForDb.bandconeSequelize = undefined;
  globalForDb.bandconeOwnerSequelize = undefined;
  globalForDb.bandconeReplicaSequelize = undefined;
  for (const pool of pools) await pool?.close();
}
