/**
 * Asynchronous transactions on the one SQLite connection (server/storage/transactions.ts, issue
 * 15): a route's transaction may await something real (here a timer) while the rest of the
 * server goes on. On one connection every statement joins whatever transaction is open, so:
 * - the write queue's commit on that connection (the external-broker set-up, runtime.ts
 *   `commitThread: false`) waits for the transaction's end: its rows, acknowledged to the broker
 *   after the commit, are never rolled back with the route's transaction;
 * - another request's store call waits too, and is not rolled back with it;
 * - a nested transaction is a savepoint; two outermost ones never interleave.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { openStorage, type SqliteStorage } from '../../server/storage/storage.ts';
import { emptyWriteBatch, type WriteBatch } from '../../server/storage/writeBatch.ts';

const dirs: string[] = [];
afterAll(() => {
  for (const d of dirs) fs.rmSync(d, { recursive: true, force: true });
});

/** A fresh database file with one site and one sensor (invented: Brackenfold Common, north mast). */
async function freshStorage(): Promise<{ storage: SqliteStorage; sensorId: number }> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-transactions-'));
  dirs.push(dir);
  const storage = openStorage(path.join(dir, 'holdfast.sqlite'));
  const site = await storage.site.insert({ name: 'Brackenfold Common', defaultLevelsJson: [], createdAtMs: 0, updatedAtMs: 0 });
  const sensor = await storage.sensors.insert({ siteId: site.id, key: 'north-mast', name: 'North mast', heightM: 10, createdAtMs: 0 });
  return { storage, sensorId: sensor.id };
}

const t0 = Date.UTC(2026, 5, 13, 12);

function readings(sensorId: number, count: number): WriteBatch {
  const batch = emptyWriteBatch();
  for (let i = 0; i < count; i++) batch.readings.push({ sensorId, tsMs: t0 + i * 1000, speedMps: 6, gustMps: null, dirDeg: 250, tempC: null, pressurePa: null, rhPct: null, late: false, rollupGustMps: 6 });
  return batch;
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
const readingCount = (storage: SqliteStorage): number => (storage.opened.sqlite.prepare('SELECT COUNT(*) AS n FROM readings').get() as { n: number }).n;

describe('a transaction that awaits, on the connection the write queue commits on', () => {
  it('holds the queue’s commit until it ends: rolled back, the queue’s rows stay stored', async () => {
    const { storage, sensorId } = await freshStorage();
    // As with an external broker: the group commit runs on the main connection.
    const queue = storage.writes.queue(() => t0, 0, new Map(), { commitThread: false });
    const events: string[] = [];
    let committed: Promise<{ stored: boolean }> | null = null;
    const route = storage.transaction(async () => {
      await storage.meta.set('route-change', 'made inside the transaction', t0);
      // Readings arrive while the route waits on something real; the queue commits on the next turn.
      committed = queue.enqueue(readings(sensorId, 20)).then((outcome) => {
        events.push('queue committed');
        return outcome;
      });
      await sleep(50);
      events.push('route gives up');
      throw new Error('the route failed after its first write');
    });
    await expect(route).rejects.toThrow('the route failed after its first write');
    expect(await committed!).toEqual({ stored: true });
    // The rollback took the route's write and left the readings, acknowledged as stored, in place …
    expect(await storage.meta.get('route-change')).toBeNull();
    expect(readingCount(storage)).toBe(20);
    // … because the commit waited for the transaction's end.
    expect(events).toEqual(['route gives up', 'queue committed']);
    queue.stop();
    await storage.close();
  });

  it('holds the open minutes and a settle the same way', async () => {
    const { storage, sensorId } = await freshStorage();
    const queue = storage.writes.queue(() => t0, 0, new Map(), { commitThread: false });
    void queue.enqueue(readings(sensorId, 5));
    queue.flush();
    const minutes = () => (storage.opened.sqlite.prepare('SELECT COALESCE(SUM(sample_count), 0) AS n FROM wind_minutes').get() as { n: number }).n;
    let settled: Promise<void> | null = null;
    const route = storage.transaction(async () => {
      await storage.meta.set('route-change', 'x', t0);
      settled = queue.settle();
      await sleep(30);
      throw new Error('rolled back');
    });
    await expect(route).rejects.toThrow('rolled back');
    await settled;
    expect(minutes()).toBe(5);
    expect(readingCount(storage)).toBe(5);
    queue.stop();
    await storage.close();
  });
});

describe('transactions and store calls from elsewhere', () => {
  it('a store call from another request waits for the open transaction and is not rolled back with it', async () => {
    const { storage } = await freshStorage();
    const events: string[] = [];
    const route = storage.transaction(async () => {
      await storage.meta.set('route-change', 'inside', t0);
      await sleep(40);
      events.push('route gives up');
      throw new Error('rolled back');
    });
    // Another request, outside the transaction's async context, while it is open.
    await sleep(5);
    expect(storage.opened.sqlite.inTransaction).toBe(true);
    const other = storage.meta.set('other-request', 'outside', t0).then(() => void events.push('other request wrote'));
    await expect(route).rejects.toThrow('rolled back');
    await other;
    expect(events).toEqual(['route gives up', 'other request wrote']);
    expect(await storage.meta.get('route-change')).toBeNull();
    expect(await storage.meta.get('other-request')).toBe('outside');
    await storage.close();
  });

  it('two transactions never interleave: the second begins after the first commits', async () => {
    const { storage } = await freshStorage();
    const events: string[] = [];
    const first = storage.transaction(async () => {
      events.push('first begins');
      await storage.meta.set('first', '1', t0);
      await sleep(30);
      events.push('first ends');
    });
    const second = storage.transaction(async () => {
      events.push('second begins');
      // It sees what the first committed.
      events.push(`second reads ${await storage.meta.get('first')}`);
    });
    await Promise.all([first, second]);
    expect(events).toEqual(['first begins', 'first ends', 'second begins', 'second reads 1']);
    await storage.close();
  });

  it('a nested transaction is a savepoint: its failure undoes only its own writes', async () => {
    const { storage } = await freshStorage();
    await storage.transaction(async () => {
      await storage.meta.set('outer', 'kept', t0);
      await expect(
        storage.transaction(async () => {
          await storage.meta.set('inner', 'undone', t0);
          await sleep(5);
          throw new Error('inner refused');
        }),
      ).rejects.toThrow('inner refused');
      await storage.transaction(async () => {
        await storage.meta.set('inner-2', 'kept', t0);
      });
    });
    expect(await storage.meta.get('outer')).toBe('kept');
    expect(await storage.meta.get('inner')).toBeNull();
    expect(await storage.meta.get('inner-2')).toBe('kept');
    expect(storage.opened.sqlite.inTransaction).toBe(false);
    await storage.close();
  });
});
