/**
 * A defect of ours on the per-message path (an exception while taking a reading) must not stall
 * ingest: left unacknowledged, the message would be redelivered for ever and hold up every
 * message behind it. It is rejected with a reason, counted, and nothing of it is stored. The
 * failing step is a stand-in consumer (the live watch has no known input that throws); the
 * database, registry, rejection log and write queue are the server's own.
 */
import { describe, expect, it } from 'vitest';
import { IngestPipeline, type ReadingConsumer } from '../../server/ingest/pipeline.ts';
import { Registry } from '../../server/ingest/registry.ts';
import { RejectionLog } from '../../server/ingest/rejections.ts';
import { createLogger } from '../../server/log.ts';
import { openDatabase } from '../../server/storage/database.ts';
import { SqliteStorage } from '../../server/storage/storage.ts';
import { WriteQueue } from '../../server/storage/writeQueue.ts';

describe('the ingest pipeline', () => {
  it('rejects and counts a message whose handling throws, instead of leaving it unacknowledged', async () => {
    const opened = openDatabase(':memory:');
    const { sqlite } = opened;
    const storage = new SqliteStorage(opened);
    sqlite.prepare("INSERT INTO sites (id, name, default_levels_json, created_at_ms, updated_at_ms) VALUES (1, 'Brackenfold Common', '[]', 0, 0)").run();
    sqlite.prepare("INSERT INTO sensors (id, site_id, key, name, height_m, created_at_ms) VALUES (1, 1, 'north-mast', 'North mast', 10, 0)").run();
    const rejections = await RejectionLog.open(storage.rejections, createLogger('silent'));
    const broken: ReadingConsumer = {
      take: () => {
        throw new TypeError("Cannot read properties of undefined (reading 'gustMps')");
      },
    };
    const queue = new WriteQueue(sqlite);
    const pipeline = new IngestPipeline('wind', await Registry.load(storage), rejections, broken, queue);
    await expect(pipeline.accept('wind/north-mast/reading', Buffer.from(JSON.stringify({ ts: Date.now(), speed: 8 })), Date.now())).resolves.toBeUndefined();
    queue.settle();
    expect(pipeline.counters).toMatchObject({ messages: 1, rejectedMessages: 1, acceptedReadings: 0 });
    expect(rejections.list('north-mast')).toEqual([expect.objectContaining({ reason: 'internal-error', count: 1 })]);
    expect(rejections.list('north-mast')[0]!.lastDetail).toMatch(/could not handle this message: TypeError/);
    expect((sqlite.prepare('SELECT COUNT(*) AS n FROM readings').get() as { n: number }).n).toBe(0);
    await rejections.flush();
    sqlite.close();
  });
});
