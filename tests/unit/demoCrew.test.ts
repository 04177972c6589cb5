/**
 * The demo's simulated crew keep the rule every acknowledgement keeps (design §5 v2: nothing is
 * announced before its commit): an acknowledgement is stored first, and only then does the watch
 * mark the alert and the stream say so, as POST /api/alerts/:id/acknowledge does. Invented
 * scenario: a quay banner whose Prepare action rolls it.
 */
import { describe, expect, it } from 'vitest';
import { DemoCrew } from '../../server/demo/demoCrew.ts';
import { seededRandom } from '../../server/demo/random.ts';
import type { RegisteredSensor } from '../../server/ingest/registry.ts';
import { LiveHub } from '../../server/live/liveHub.ts';
import type { WriteBatch } from '../../server/storage/writeBatch.ts';
import { Watch } from '../../server/watch/watch.ts';
import { testSite } from '../helpers/testSite.ts';

describe('the demo crew acknowledge as people do', () => {
  it('store the acknowledgement before the watch marks the alert and the stream announces it', async () => {
    const t0 = Date.UTC(2026, 7, 1, 12, 0, 0);
    let now = t0;
    const hub = new LiveHub(1000);
    const announced: string[] = [];
    hub.observe((event) => announced.push(event.kind));
    const watch = new Watch({ hub, now: () => now });
    const mast: RegisteredSensor = { id: 1, siteId: 1, key: 'quay-mast', name: 'Quay mast', heightM: 10, location: '', latDeg: null, lonDeg: null, unit: 'm/s', mode: 'summaries', silenceTimeoutMs: 60_000, createdAtMs: t0, retiredAtMs: null };
    const recordJson = {
      kind: 'custom', name: 'Quay banner', baseDepthM: 2, frictionCoefficient: 0.4, referenceHeightM: 10, faces: [{ areaM2: 8, centroidHeightM: 5, cfFront: 1.8, cfBack: 1.8 }],
      masses: [{ massKg: 4000, xM: 1 }], coefficientSource: 'EN 1991-1-4 7.4.3 signboard c_f 1.80', configurations: [{ name: 'rolled', changes: { faces: [{ areaM2: 2, centroidHeightM: 5, cfFront: 1.8, cfBack: 1.8 }] } }],
    };
    const levels = [
      { label: 'Prepare', trigger: { kind: 'utilization', fraction: 0.5 }, actionText: 'Roll the banner.', moveToConfiguration: 'rolled' },
      { label: 'Take down', trigger: { kind: 'utilization', fraction: 1 }, actionText: 'Take the banner down.' },
    ];
    watch.configure(testSite(), [mast], [{ id: 1, name: 'Quay banner', kind: 'custom', orientationDeg: 0, mobile: false, sensorKeysJson: null, levelsJson: levels, recordJson }]);
    const ladder = watch.structureStateById(1)!.triggerGustsMps;
    const gustMps = (ladder[0]! + ladder[1]!) / 2;
    for (let i = 0; i < 3; i++) {
      now += 1_000;
      watch.take(mast, [{ tsMs: now, speedMps: gustMps / 1.5, gustMps, dirDeg: 240, tempC: null, pressurePa: null, rhPct: null }], now);
    }
    const alert = watch.openAlerts().find((a) => a.kind === 'level')!;
    expect(alert.level).toBe(1);

    const stored: WriteBatch[] = [];
    let commit: () => void = () => {};
    const crew = new DemoCrew({
      watch, random: seededRandom(5), kindOf: () => 'custom', crew: ['Deck crew'], competentPerson: 'Site lead', doneAfterMs: [3_600_000, 3_600_000],
      actionDueMs: 5 * 60_000, lateKind: 'custom', calmForMs: 600_000,
      store: (batch) => {
        stored.push(batch);
        return new Promise<void>((resolve) => (commit = resolve));
      },
    });
    crew.step(now);
    // The late action is acknowledged 45–105 s after its alert (demoCrew.ts), and done much later.
    now = alert.raisedAtMs + 106_000;
    crew.step(now);
    expect(stored.map((b) => b.acknowledgements.length)).toEqual([1]);
    expect(stored[0]!.acknowledgements[0]).toMatchObject({ alertId: alert.id, by: 'Deck crew' });
    // Not yet committed: the watch has not marked it, and the stream has not said so.
    expect(watch.openAlert(alert.id)!.acknowledgedAtMs).toBeNull();
    const updatesBefore = announced.filter((k) => k === 'alert-update').length;
    expect(updatesBefore).toBe(0);
    commit();
    await new Promise((resolve) => setImmediate(resolve));
    expect(watch.openAlert(alert.id)!.acknowledgedBy).toBe('Deck crew');
    expect(announced.filter((k) => k === 'alert-update')).toHaveLength(1);
    crew.step(now + 1_000);
    expect(stored).toHaveLength(1);
  });
});
