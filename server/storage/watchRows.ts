/**
 * The live watch's domain events (watch/watchEvents.ts) as the rows of one write batch: level
 * changes and data spells as level-change rows, configuration switches as their own, the alert
 * book's events through alertRows.ts.
 */
import type { WatchEvent } from '../watch/watchEvents.ts';
import { alertEventRows } from './alertRows.ts';
import type { WriteBatch } from './writeBatch.ts';

export function watchEventRows(events: readonly WatchEvent[], siteId: number, batch: WriteBatch): void {
  for (const e of events) {
    switch (e.type) {
      case 'level-changed':
        batch.levelChanges.push({ structureId: e.structureId, atMs: e.atMs, fromLevel: e.fromLevel, toLevel: e.toLevel, gustMps: e.gustMps, utilization: e.utilization, noData: false, estimate: e.estimate });
        break;
      case 'data-lost':
        batch.levelChanges.push({ structureId: e.structureId, atMs: e.atMs, fromLevel: e.level, toLevel: e.level, gustMps: null, utilization: null, noData: true });
        break;
      case 'data-restored':
        batch.levelChanges.push({ structureId: e.structureId, atMs: e.atMs, fromLevel: e.level, toLevel: e.level, gustMps: e.gustMps, utilization: e.utilization, noData: false });
        break;
      case 'configuration-changed': {
        const { type: _type, ...row } = e;
        batch.configurationChanges.push(row);
        break;
      }
      default:
        alertEventRows([e], siteId, batch);
    }
  }
}
