/**
 * Rejection records stay bounded (issue 13 item 9): the release made one entry and one log line
 * per distinct unknown topic key (1,000 keys → 1,000 entries and log lines in 2.5 s). Now at most
 * 200 keys are counted one by one, the rest in one "other keys" entry per reason (registered
 * sensors always keep their own), and at most 20 log lines a minute across keys, then one line
 * with how many were left out. Counts stay complete. Common practice (no published source):
 * bound what an unauthenticated or misconfigured sender can make a server keep.
 */
import { describe, expect, it } from 'vitest';
import { openDatabase } from '../../server/storage/database.ts';
import { SqliteStorage } from '../../server/storage/storage.ts';
import { RejectionLog, maxRejectionKeys, maxRejectionLogLinesPerInterval, otherKeysBucket } from '../../server/ingest/rejections.ts';
import type { Logger } from '../../server/log.ts';

function recordingLogger(lines: unknown[]): Logger {
  const log = { warn: (o: unknown) => void lines.push(o), error: (o: unknown) => void lines.push(o), info: () => undefined, debug: () => undefined, child: () => log };
  return log as unknown as Logger;
}

describe('1,000 distinct unknown keys', () => {
  it('make at most 200 + 1 entries, all 1,000 counted, and at most 20 log lines in the minute', async () => {
    const opened = openDatabase(':memory:');
    const { sqlite } = opened;
    const lines: unknown[] = [];
    let now = Date.UTC(2026, 7, 8, 12, 0, 0);
    const log = await RejectionLog.open(new SqliteStorage(opened).rejections, recordingLogger(lines), () => now, (key) => key === 'gate-mast');
    for (let i = 0; i < 1000; i++) {
      now += 2;
      log.record(`ghost-${i}`, 'not-permitted', `no sensor is registered with the key "ghost-${i}"`);
    }
    const list = log.list();
    expect(list.length).toBe(maxRejectionKeys + 1);
    expect(list.reduce((n, e) => n + e.count, 0)).toBe(1000);
    expect(log.totalCount).toBe(1000);
    const other = list.find((e) => e.sensorKey === otherKeysBucket)!;
    expect(other.count).toBe(800);
    expect(other.lastDetail).toContain('ghost-999');
    expect(lines.length).toBe(maxRejectionLogLinesPerInterval);
    // A registered sensor still gets its own entry past the cap.
    log.record('gate-mast', 'not-json', 'body is not JSON');
    expect(log.list('gate-mast')).toHaveLength(1);
    // A minute later the left-out lines are summed in one line.
    now += 61_000;
    log.record('ghost-5', 'not-permitted', 'again');
    expect(lines.some((l) => (l as { notLogged?: number }).notLogged === 1000 - maxRejectionLogLinesPerInterval + 1)).toBe(true);
    await log.flush();
    expect((sqlite.prepare('SELECT COUNT(*) AS n FROM rejections').get() as { n: number }).n).toBe(maxRejectionKeys + 2);
  });
});
