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
      pool: { max: Number(process.env.DB_POOL_MAX ?? 10), min: 0, idle: 10_000 },
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
