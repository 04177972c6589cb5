/**
 * The demo's past windy day moves its structures through their plan actions (design §2.5, issue
 * 14): `npm run demo`'s own code (runDemo: register, simulated day through a real watch, write
 * queue and SQLite) leaves yesterday's log with the screen lowered, the marquee's sides off and
 * the fence's scrim removed by the crew's "Done" on their alerts, switched back by hand by the
 * competent person once the wind dropped, and one action late — signalled again as overdue
 * before it was done — as the log and the day report show it. Read over HTTP as a viewer would.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { configFromEnv } from '../../server/config.ts';
import { runDemo } from '../../server/demo/demo.ts';
import { demoPeople, demoStructures } from '../../server/demo/demoSite.ts';
import { createLogger } from '../../server/log.ts';
import type { RunningServer } from '../../server/runtime.ts';
import { parseRfc4180 } from '../helpers/rfc4180.ts';
import { ApiClient } from '../helpers/testServer.ts';

const timeZone = 'Europe/London';
let server: RunningServer;
let dataDir = '';
let cp: ApiClient;
let yesterday = '';

function dayBefore(day: string): string {
  const d = new Date(`${day}T12:00:00Z`);
  d.setUTCDate(d.getUTCDate() - 1);
  return d.toISOString().slice(0, 10);
}

beforeAll(async () => {
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'holdfast-demo-actions-'));
  const config = configFromEnv({ DATA_DIR: dataDir, PORT: '0', HOST: '127.0.0.1', MQTT_PORT: '0', MQTT_HOST: '127.0.0.1', DEMO: '1' });
  server = await runDemo(config, createLogger('error'));
  yesterday = dayBefore(new Intl.DateTimeFormat('en-CA', { timeZone }).format(new Date()));
  cp = new ApiClient(`http://127.0.0.1:${server.httpPort}`);
  const login = demoPeople.find((p) => p.role === 'competent-person')!;
  expect((await cp.signIn(login.username, login.password)).status).toBe(200);
}, 120_000);

afterAll(async () => {
  await server?.close();
  if (dataDir) fs.rmSync(dataDir, { recursive: true, force: true });
});

describe('yesterday in the demo log: the plan’s actions', () => {
  it('each of the three structures was moved by a crew member’s Done on its alert, and back by hand by the competent person', async () => {
    const { configurationChanges } = (await cp.json('GET', `/api/log/configurations?day=${yesterday}`)).body;
    const crew = new Set(['Sam Okoro (site crew)', 'Priya Nandakumar (stage manager)']);
    const cpName = 'Dana Whitlock (competent person)';
    for (const [structure, moved] of [
      ['Stage-left LED screen', 'lowered'],
      ['Food hall marquee', 'sides off'],
      ['North fence scrim', 'scrim removed'],
    ] as const) {
      const own = configurationChanges.filter((c: any) => c.structureName === structure);
      const done = own.filter((c: any) => c.reason === 'action-done');
      expect(done.length, structure).toBeGreaterThan(0);
      for (const c of done) {
        expect(c.to).toBe(moved);
        expect(crew.has(c.by), c.by).toBe(true);
        expect(c.alertId).not.toBeNull();
        expect(c.atMs).toBeGreaterThan(c.alertRaisedAtMs);
      }
      const back = own.filter((c: any) => c.reason === 'by-hand');
      expect(back.length, structure).toBeGreaterThan(0);
      for (const c of back) {
        expect(c.by).toBe(cpName);
        expect(c.from).toBe(moved);
        expect(c.note).toMatch(/wind well down/i);
      }
      // Each switch starts where the one before it ended.
      for (let i = 1; i < own.length; i++) expect(own[i].from).toBe(own[i - 1].to);
    }
    // Every configuration named exists on the demo record.
    const names = new Set(demoStructures.flatMap((s) => [(s.record as any).configurationName, ...((s.record as any).configurations ?? []).map((c: any) => c.name)]));
    for (const c of configurationChanges) expect(names.has(c.to), c.to).toBe(true);
  });

  it('one action came late: signalled again as overdue, then done, and the day report counts it late', async () => {
    const { overdueSignals, configurationChanges } = (await cp.json('GET', `/api/log/configurations?day=${yesterday}`)).body;
    expect(overdueSignals).toHaveLength(1);
    const [o] = overdueSignals;
    const { site } = (await cp.json('GET', '/api/site')).body;
    expect(o.atMs - o.raisedAtMs).toBeGreaterThanOrEqual(site.actionDueMs);
    expect(o.actionDoneAtMs).toBeGreaterThan(o.atMs);
    expect(configurationChanges.find((c: any) => c.alertId === o.alertId)).toMatchObject({ reason: 'action-done', alertOverdueAtMs: o.atMs });
    const summary = (await cp.json('GET', `/api/log/summary?day=${yesterday}`)).body;
    expect(summary.actionsLateCount).toBe(1);
    expect(summary.actionsDoneCount).toBeGreaterThanOrEqual(3);
    const lateOnes = summary.structures.flatMap((s: any) => s.alerts.filter((a: any) => a.actionLate === true));
    expect(lateOnes.map((a: any) => a.id)).toEqual([o.alertId]);
    // Every other action was done within the site's action time.
    for (const s of summary.structures) for (const a of s.alerts) if (a.actionLate === false) expect(a.actionDoneAtMs - a.raisedAtMs).toBeLessThanOrEqual(site.actionDueMs);
  });

  it('the CSV of configuration changes lists the same switches', async () => {
    const text = await (await cp.request('GET', `/api/export/configuration-changes.csv?day=${yesterday}`)).text();
    const [header, ...rows] = parseRfc4180(text);
    const { configurationChanges } = (await cp.json('GET', `/api/log/configurations?day=${yesterday}`)).body;
    expect(rows.length).toBe(configurationChanges.length);
    const at = (column: string) => header!.indexOf(column);
    expect(rows.map((r) => [r[at('structure')], r[at('to')], r[at('by')]])).toEqual(configurationChanges.map((c: any) => [c.structureName, c.to, c.by]));
    expect(rows.filter((r) => r[at('signalled_overdue')] === 'yes')).toHaveLength(1);
  });

  it('the live demo starts in the configuration the log last recorded', async () => {
    const live = (await cp.json('GET', '/api/live')).body;
    const { configurationChanges } = (await cp.json('GET', `/api/log/configurations?day=${yesterday}`)).body;
    for (const s of live.structures) {
      const last = configurationChanges.filter((c: any) => c.structureId === s.id).at(-1);
      if (last) expect(s.configuration, s.name).toBe(last.to);
    }
  });
});
