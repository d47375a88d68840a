import { Sequelize } from 'sequelize';
import pg from 'pg';
import { databaseUrl } from './config';

// Keep one pool per process even when Next reloads modules in development.
const globalForDb = globalThis as unknown as { bandconeSequelize?: Sequelize };

export function getSequelize(): Sequelize {
  if (!globalForDb.bandconeSequelize) {
    globalForDb.bandconeSequelize = new Sequelize(databaseUrl(), {
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
  return globalForDb.bandconeSequelize;
}

export async function closeSequelize(): Promise<void> {
  if (globalForDb.bandconeSequelize) {
    await globalForDb.bandconeSequelize.close();
    globalForDb.bandconeSequelize = undefined;
  }
}
