// Opening a ledger: an SQLite file in WAL mode with a busy timeout, migrated to the current schema.
import { accessSync, constants, existsSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import Database from 'better-sqlite3';
import { InputError } from '../errors/index.js';
import { SCHEMA_VERSION, migrate } from './schema.js';

/** The ledger file used when none is given: in the current folder. */
export const DEFAULT_LEDGER = 'jointloom-ledger.sqlite';

/** How long a writer waits for another process's transaction, ms. */
export const BUSY_TIMEOUT_MS = 30_000;

export type Ledger = Database.Database;

/** Returns an open, migrated ledger (created when missing unless `mustExist`); throws InputError when it cannot be used. */
export function openLedger(file: string, o: { mustExist?: boolean; readonly?: boolean } = {}): Ledger {
  if ((o.mustExist || o.readonly) && !existsSync(file)) throw new InputError(`${file}: no such ledger.`);
  if (!existsSync(file)) {
    try { accessSync(dirname(resolve(file)), constants.W_OK); } catch { throw new InputError(`${file}: cannot create the ledger here (folder missing or not writable).`); }
  }
  let db: Ledger;
  try {
    db = new Database(file, { readonly: o.readonly ?? false, timeout: BUSY_TIMEOUT_MS });
    db.pragma(`busy_timeout = ${BUSY_TIMEOUT_MS}`);
    if (!o.readonly) db.pragma('journal_mode = WAL');
    db.pragma('foreign_keys = ON');
    if (!o.readonly) db.pragma('synchronous = NORMAL');
    db.prepare('SELECT count(*) FROM sqlite_master').get();
  } catch (e) {
    throw new InputError(`${file}: not a usable ledger (${(e as Error).message}).`);
  }
  if (!o.readonly) {
    migrate(db, file);
  } else {
    const v = db.pragma('user_version', { simple: true }) as number;
    if (v !== SCHEMA_VERSION) { db.close(); throw new InputError(`${file}: schema version ${v}; open it once without read-only access to migrate it.`); }
  }
  return db;
}
