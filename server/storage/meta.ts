/** Small named values the server keeps (the setup code's hash, the acknowledgement-link secret, the demo's marks). */
import { eq } from 'drizzle-orm';
import { metaTable } from '../../db/schema.ts';
import type { Db } from './database.ts';

export class MetaStore {
  constructor(private readonly db: Db) {}

  get(key: string): string | null {
    return this.db.select().from(metaTable).where(eq(metaTable.key, key)).get()?.value ?? null;
  }

  set(key: string, value: string, atMs: number): void {
    this.db.insert(metaTable).values({ key, value, updatedAtMs: atMs }).onConflictDoUpdate({ target: metaTable.key, set: { value, updatedAtMs: atMs } }).run();
  }

  /** Stores the value unless the key has one; returns the value the key has now. */
  setIfAbsent(key: string, value: string, atMs: number): string {
    this.db.insert(metaTable).values({ key, value, updatedAtMs: atMs }).onConflictDoNothing().run();
    return this.get(key)!;
  }

  delete(key: string): void {
    this.db.delete(metaTable).where(eq(metaTable.key, key)).run();
  }
}
