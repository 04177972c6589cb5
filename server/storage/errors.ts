/**
 * Database errors by kind, classified in this one place so that the HTTP layer maps each kind
 * once (app.ts onError) and the health report can say what went wrong in words. A PostgreSQL
 * storage maps its SQLSTATE codes to the same kinds here.
 *
 * SQLite's result codes (https://www.sqlite.org/rescode.html): SQLITE_CONSTRAINT_UNIQUE and
 * _PRIMARYKEY for a duplicate key, other SQLITE_CONSTRAINT_* for a broken rule (foreign key, NOT
 * NULL, CHECK, a trigger's RAISE), SQLITE_FULL for a full disk, SQLITE_READONLY* for a folder
 * or file that cannot be written, SQLITE_IOERR* and SQLITE_CANTOPEN for the disk failing,
 * SQLITE_BUSY / SQLITE_LOCKED for another writer holding the lock past the busy timeout,
 * SQLITE_CORRUPT and SQLITE_NOTADB for a damaged file.
 */

export const storageErrorKinds = ['unique', 'constraint', 'disk-full', 'read-only', 'io', 'busy', 'corrupt'] as const;
export type StorageErrorKind = (typeof storageErrorKinds)[number];

/** What each kind means, in words a caller may read (never the SQL or the driver's text). */
export const storageErrorWords: Record<StorageErrorKind, string> = {
  unique: 'that already exists',
  constraint: 'the change breaks a rule of the stored data',
  'disk-full': 'the database cannot write: the disk is full',
  'read-only': 'the database cannot write: its folder or file is read-only',
  io: 'the database cannot read or write the disk',
  busy: 'the database is busy; try again',
  corrupt: 'the database file is damaged',
};

/** The driver's error code, looked for on the error and on its causes (drizzle wraps the driver's error). */
function codeOf(err: unknown): string | null {
  for (let e: unknown = err, depth = 0; e !== null && typeof e === 'object' && depth < 5; e = (e as { cause?: unknown }).cause, depth++) {
    const code = (e as { code?: unknown }).code;
    if (typeof code === 'string' && code.startsWith('SQLITE_')) return code;
  }
  return null;
}

/** The kind of a database error, or null when `err` is not one (a bug, a domain error). */
export function classifyStorageError(err: unknown): StorageErrorKind | null {
  const code = codeOf(err);
  if (code === null) return null;
  if (code === 'SQLITE_CONSTRAINT_UNIQUE' || code === 'SQLITE_CONSTRAINT_PRIMARYKEY') return 'unique';
  if (code.startsWith('SQLITE_CONSTRAINT')) return 'constraint';
  if (code === 'SQLITE_FULL') return 'disk-full';
  if (code.startsWith('SQLITE_READONLY')) return 'read-only';
  if (code.startsWith('SQLITE_IOERR') || code.startsWith('SQLITE_CANTOPEN')) return 'io';
  if (code.startsWith('SQLITE_BUSY') || code.startsWith('SQLITE_LOCKED')) return 'busy';
  if (code.startsWith('SQLITE_CORRUPT') || code === 'SQLITE_NOTADB') return 'corrupt';
  return null;
}
