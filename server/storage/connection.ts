/**
 * The settings of every connection to the database file: the main thread's (openDatabase) and the
 * commit thread's (commitWorker.ts); apart from database.ts so the worker does not load the query
 * builder and the migrations.
 */
import type Database from 'better-sqlite3';

/**
 * WAL: readers never block the writer, and a reader on another connection sees each commit;
 * NORMAL: a commit is durable against a process crash (SIGKILL) and reaches the disk at the next
 * checkpoint — the trade-off documented in DEVELOPERS.md ("durability"). The busy timeout orders
 * the two connections' writes.
 */
export function configureConnection(sqlite: Database.Database): void {
  sqlite.pragma('journal_mode = WAL');
  sqlite.pragma('synchronous = NORMAL');
  sqlite.pragma('foreign_keys = ON');
  sqlite.pragma('busy_timeout = 5000');
}
