import path from 'node:path';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { createDb, databaseUrl } from './client';

export const MIGRATIONS_FOLDER = path.resolve(__dirname, 'migrations');

/** Applies the committed SQL migrations (idempotent). */
export async function runMigrations(url: string = databaseUrl()): Promise<void> {
  const { db, pool } = createDb(url, 1);
  try {
    await migrate(db, { migrationsFolder: MIGRATIONS_FOLDER });
  } finally {
    await pool.end();
  }
}

if (require.main === module) {
  runMigrations()
    .then(() => console.log('keelson: migrations applied'))
    .catch((err) => {
      console.error('keelson: migration failed:', err.message);
      process.exit(1);
    });
}
