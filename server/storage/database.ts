/**
 * Opens the SQLite database, sets it up for durable batched writes and applies the committed
 * migrations (db/migrations) with drizzle's migrator. Synchronous and idempotent.
 */
import fs from 'node:fs';
import path from 'node:path';
import Database from 'better-sqlite3';
import { drizzle, type BetterSQLite3Database } from 'drizzle-orm/better-sqlite3';
import type { BaseSQLiteDatabase } from 'drizzle-orm/sqlite-core';
import { migrate } from 'drizzle-orm/better-sqlite3/migrator';
import * as schema from '../../db/schema.ts';
import { configureConnection } from './connection.ts';

export type Db = BetterSQLite3Database<typeof schema> & { $client: Database.Database };
/** The database or a transaction on it: what query functions take, so they compose inside transactions. */
export type Tx = BaseSQLiteDatabase<'sync', Database.RunResult, typeof schema>;

export interface OpenedDatabase {
  db: Db;
  sqlite: Database.Database;
  file: string;
}

/** The committed migrations, found from the working directory (npm scripts run at the repo root). */
export function migrationsFolder(): string {
  return path.resolve(process.env.MIGRATIONS_DIR ?? 'db/migrations');
}

/** `file` ':memory:' gives a throwaway database (tests). */
export function openDatabase(file: string): OpenedDatabase {
  if (file !== ':memory:') fs.mkdirSync(path.dirname(file), { recursive: true });
  const sqlite = new Database(file);
  configureConnection(sqlite);
  const db = drizzle({ client: sqlite, schema }) as Db;
  migrate(db, { migrationsFolder: migrationsFolder() });
  return { db, sqlite, file };
}
