/**
 * The log of the plan's actions (design §2.5, §2.8; issue 14) over HTTP: configuration switches
 * and overdue signals in GET /api/log/configurations, the structure's log, the alerts' action
 * columns, the day summary's actions (done, by whom, how long after, late), the CSV exports
 * (configuration-changes.csv new; alerts.csv and level-changes.csv with columns added at the end,
 * checked against the README's documented list), and the forecast check in both configurations.
 *
 * Driven through the real route POST /api/structures/:id/configuration, as a crew member's
 * "Done" and a competent person's switch by hand, on a real server (embedded broker, SQLite,
 * HTTP on 127.0.0.1) with the clock in the test's hand.
 *
 * The screen is the one hand-worked in tests/unit/configuration.test.ts (EN 1991-1-4 §7.4.3
 * signboard c_f 1.80 and eccentricity ±0.25·b, γ_ot 1.5): limit 14.75 m/s raised, 18.43 m/s
 * lowered at 1.225 kg/m³; a limit goes with 1/√ρ (q = ½ρv²). Names and site invented.
 */
import fs from 'node:fs';
import mqtt, { type MqttClient } from 'mqtt';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseRfc4180 } from '../helpers/rfc4180.ts';
import { ApiClient, adminPassword, adminUsername, startTestServer, waitFor, type TestServer } from '../helpers/testServer.ts';
import { harbourLevels, harbourScreen } from '../helpers/harbourScreen.ts';

const timeZone = 'Europe/Berlin';
let clock = Date.UTC(2026, 7, 8, 9, 0, 0);
const startMs = clock;
let ts: TestServer;
let cp: ApiClient;
let crew: ApiClient;
let gateway: MqttClient;
let screenId = 0;
/** The two alerts whose action lowers the screen: done in time, and done late. */
let onTime: any;
let late: any;
let onTimeDoneAtMs = 0;
let byHandAtMs = 0;
let lateDoneAtMs = 0;
let overdueAtMs = 0;

const crewName = 'Jonah Beck (rigger)';
const cpName = 'Ilse Marten (competent person)';

const screen = { ...harbourScreen, name: 'Quayside LED wall' };

const levels = harbourLevels.map((level, i) => (i === 0 ? { ...level, actionText: 'Crew to the wall; clear the area behind it.' } : level));

async function publish(gustMps: number): Promise<void> {
  clock += 1_000;
  await gateway.publishAsync('wind/quay-mast/reading', JSON.stringify({ ts: clock, speed: gustMps / 1.5, gust: gustMps, dir: 250 }), { qos: 1 });
}

async function ok(res: Promise<{ status: number; body: any }>, status = 200): Promise<any> {
  const r = await res;
  expect(r.status, JSON.stringify(r.body)).toBe(status);
  return r.body;
}

async function liveScreen(): Promise<any> {
  return (await ok(cp.json('GET', '/api/live'))).structures.find((s: any) => s.id === screenId);
}

/** The site's wall clock at an instant, "YYYY-MM-DD HH:MM:SS", by Intl.DateTimeFormat alone. */
function intlSiteTime(atMs: number): string {
  const parts = new Intl.DateTimeFormat('en-US', { timeZone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit' }).formatToParts(new Date(atMs));
  const get = (type: Intl.DateTimeFormatPartTypes): string => parts.find((p) => p.type === type)!.value;
  return `${get('year')}-${get('month')}-${get('day')} ${get('hour')}:${get('minute')}:${get('second')}`;
}

/** A CSV's records as objects keyed by the header (every record checked to have the header's field count, RFC 4180 2.4). */
function csv(text: string): { header: string[]; rows: Array<Record<string, string>> } {
  const [header, ...rows] = parseRfc4180(text);
  for (const r of rows) expect(r.length).toBe(header!.length);
  return { header: header!, rows: rows.map((r) => Object.fromEntries(header!.map((h, k) => [h, r[k]!]))) };
}

/** The columns the README's "CSV exports" table documents for a table, in order. */
function readmeColumns(table: string): string[] {
  const readme = fs.readFileSync('README.md', 'utf8');
  const line = readme.split('\n').find((l) => l.startsWith(`| \`${table}\` |`));
  expect(line, `README lists ${table}`).toBeDefined();
  const cell = line!.split(' | ')[1]!;
  // Each column is the first back-quoted word of its entry; explanations in brackets may quote values.
  return cell
    .replace(/\([^)]*\)/g, '')
    .split(',')
    .map((part) => /`([a-z0-9_]+)`/.exec(part)?.[1])
    .filter((c): c is string => c !== undefined);
}

const window = () => `from=${startMs}&to=${clock + 1_000}`;

beforeAll(async () => {
  ts = await startTestServer({}, { now: () => clock, tickMs: 60_000 });
  cp = new ApiClient(ts.baseUrl);
  const admin = new ApiClient(ts.baseUrl);
  await admin.signIn(adminUsername, adminPassword);
  await ok(admin.json('PATCH', '/api/site', { timeZone, holdTimeMs: 600_000, actionDueMs: 180_000 }));
  await ok(admin.json('POST', '/api/people', { username: 'ilse', displayName: cpName, role: 'competent-person', password: 'ilse-password-quay-1' }), 201);
  await ok(admin.json('POST', '/api/people', { username: 'jonah', displayName: crewName, role: 'crew', password: 'jonah-password-quay-1' }), 201);
  expect((await cp.signIn('ilse', 'ilse-password-quay-1')).status).toBe(200);
  crew = new ApiClient(ts.baseUrl);
  expect((await crew.signIn('jonah', 'jonah-password-quay-1')).status).toBe(200);
  await ok(cp.json('POST', '/api/sensors', { key: 'quay-mast', name: 'Quay mast', heightM: 10 }), 201);
  const gw = await ok(cp.json('POST', '/api/gateways', { name: 'Quay gateway', username: 'quay-gw', sensorKeys: ['quay-mast'] }), 201);
  screenId = (await ok(cp.json('POST', '/api/structures', { record: screen, orientationDeg: 250, levels }), 201)).structure.id;
  gateway = await mqtt.connectAsync(`mqtt://127.0.0.1:${ts.server.mqttPort}`, { username: 'quay-gw', password: gw.password, reconnectPeriod: 0 });

  // 1. 13 m/s at the mast is 13 m/s at the wall's 7 m top (no reduction below the mast): above
  //    raised "Lower the screen" 14.75·√(1.225/ρ)·√0.7 ≈ 12.2 m/s at ρ = 1.25, below "Stop".
  for (let i = 0; i < 4; i++) await publish(13);
  onTime = await waitFor(async () => (await ok(crew.json('GET', '/api/live'))).alerts.find((a: any) => a.structureId === screenId && a.level === 2), 5_000, 'the first level 2 alert');
  clock += 90_000;
  onTimeDoneAtMs = clock;
  await ok(crew.json('POST', `/api/structures/${screenId}/configuration`, { configuration: 'lowered', alertId: onTime.id, note: 'Wall down on its stops.' }));

  // 2. The wind drops; after the hold time the level clears; the competent person raises the wall by hand.
  for (let i = 0; i < 3; i++) await publish(4);
  clock += 601_000;
  await publish(4);
  await ts.server.tickNow();
  await waitFor(async () => (await liveScreen()).level < 2, 5_000, 'the level to drop');
  clock += 60_000;
  byHandAtMs = clock;
  await ok(cp.json('POST', `/api/structures/${screenId}/configuration`, { configuration: 'raised', note: 'Wind down for ten minutes; wall raised again.' }));

  // 3. A second spell; this time the action waits past the site's 3 minutes and is signalled again.
  for (let i = 0; i < 4; i++) await publish(13);
  late = await waitFor(async () => (await ok(crew.json('GET', '/api/live'))).alerts.find((a: any) => a.structureId === screenId && a.level === 2 && a.id !== onTime.id), 5_000, 'the second level 2 alert');
  expect(late.actionDueAtMs).toBe(late.raisedAtMs + 180_000);
  clock = late.actionDueAtMs + 2_000;
  overdueAtMs = clock;
  await ts.server.tickNow();
  await waitFor(async () => (await ok(cp.json('GET', '/api/live'))).alerts.find((a: any) => a.id === late.id)?.overdueAtMs === overdueAtMs, 5_000, 'the overdue signal');
  clock += 120_000;
  lateDoneAtMs = clock;
  await ok(crew.json('POST', `/api/structures/${screenId}/configuration`, { configuration: 'lowered', alertId: late.id }));
}, 30_000);

afterAll(async () => {
  await gateway?.endAsync(true).catch(() => undefined);
  await ts?.stop();
});

describe('GET /api/log/configurations', () => {
  it('lists every switch with who, when, from → to, the note, and whether it was an alert’s action or by hand', async () => {
    const log = await ok(cp.json('GET', `/api/log/configurations?${window()}`));
    expect(log.configurationChanges.map((c: any) => ({ atMs: c.atMs, structureName: c.structureName, from: c.from, to: c.to, by: c.by, note: c.note, alertId: c.alertId, reason: c.reason }))).toEqual([
      { atMs: onTimeDoneAtMs, structureName: 'Quayside LED wall', from: 'raised', to: 'lowered', by: crewName, note: 'Wall down on its stops.', alertId: onTime.id, reason: 'action-done' },
      { atMs: byHandAtMs, structureName: 'Quayside LED wall', from: 'lowered', to: 'raised', by: cpName, note: 'Wind down for ten minutes; wall raised again.', alertId: null, reason: 'by-hand' },
      { atMs: lateDoneAtMs, structureName: 'Quayside LED wall', from: 'raised', to: 'lowered', by: crewName, note: null, alertId: late.id, reason: 'action-done' },
    ]);
    const [first, , third] = log.configurationChanges;
    // The alert behind each "Done": its level and label, when it was raised, whether it had been signalled overdue.
    expect(first).toMatchObject({ alertLevel: 2, alertLabel: 'Lower the screen', alertRaisedAtMs: onTime.raisedAtMs, alertOverdueAtMs: null });
    expect(third).toMatchObject({ alertLevel: 2, alertLabel: 'Lower the screen', alertRaisedAtMs: late.raisedAtMs, alertOverdueAtMs: overdueAtMs });
  });

  it('lists the overdue signal as its own event: when, which action, and when it was done in the end', async () => {
    const log = await ok(cp.json('GET', `/api/log/configurations?${window()}`));
    expect(log.overdueSignals).toEqual([
      {
        atMs: overdueAtMs,
        alertId: late.id,
        structureId: screenId,
        structureName: 'Quayside LED wall',
        level: 2,
        label: 'Lower the screen',
        actionText: 'Lower the LED wall to its bottom stop.',
        moveToConfiguration: 'lowered',
        raisedAtMs: late.raisedAtMs,
        actionDoneAtMs: lateDoneAtMs,
        actionDoneBy: crewName,
      },
    ]);
  });

  it('filters by structure and by window, and refuses a bad structure id naming the field', async () => {
    const other = await ok(cp.json('GET', `/api/log/configurations?${window()}&structure=${screenId + 1000}`));
    expect(other.configurationChanges).toEqual([]);
    expect(other.overdueSignals).toEqual([]);
    // A window that ends before the late action keeps the first two switches and not the overdue signal.
    const early = await ok(cp.json('GET', `/api/log/configurations?from=${startMs}&to=${overdueAtMs}`));
    expect(early.configurationChanges.map((c: any) => c.reason)).toEqual(['action-done', 'by-hand']);
    expect(early.overdueSignals).toEqual([]);
    const bad = await cp.json('GET', `/api/log/configurations?${window()}&structure=wall`);
    expect(bad.status).toBe(400);
    expect(bad.body.issues.map((i: any) => i.path)).toEqual(['structure']);
  });

  it('the structure’s own log carries its switches and overdue signals', async () => {
    const log = await ok(cp.json('GET', `/api/log/structures/${screenId}?${window()}`));
    expect(log.configurationChanges.map((c: any) => c.to)).toEqual(['lowered', 'raised', 'lowered']);
    expect(log.overdueSignals.map((o: any) => o.alertId)).toEqual([late.id]);
  });
});

describe('level alerts in the log say whether and when their action was done, and by whom', () => {
  it('GET /api/log/alerts', async () => {
    const { alerts } = await ok(cp.json('GET', `/api/log/alerts?${window()}`));
    const a1 = alerts.find((a: any) => a.id === onTime.id);
    const a2 = alerts.find((a: any) => a.id === late.id);
    expect(a1).toMatchObject({ moveToConfiguration: 'lowered', actionDoneAtMs: onTimeDoneAtMs, actionDoneBy: crewName, overdueAtMs: null });
    expect(a2).toMatchObject({ moveToConfiguration: 'lowered', actionDoneAtMs: lateDoneAtMs, actionDoneBy: crewName, overdueAtMs: overdueAtMs });
    // "Done" acknowledged the alert too, with the note given (or "Done: lowered").
    expect(a1).toMatchObject({ acknowledgedBy: crewName, acknowledgeNote: 'Wall down on its stops.' });
    expect(a2).toMatchObject({ acknowledgedBy: crewName, acknowledgeNote: 'Done: lowered' });
  });

  it('the day summary: the actions done, by whom, how long after the alert, and the late one', async () => {
    const summary = await ok(cp.json('GET', `/api/log/summary?${window()}`));
    expect(summary).toMatchObject({ actionCount: 2, actionsDoneCount: 2, actionsLateCount: 1, actionsNotDoneCount: 0, actionDueMs: 180_000 });
    const s = summary.structures.find((x: any) => x.id === screenId);
    expect(s.configurationAtStart).toBe('raised');
    expect(s.configurationChanges.map((c: any) => `${c.from}→${c.to} ${c.reason} ${c.by}`)).toEqual([`raised→lowered action-done ${crewName}`, `lowered→raised by-hand ${cpName}`, `raised→lowered action-done ${crewName}`]);
    const actions = s.alerts.filter((a: any) => a.moveToConfiguration !== null);
    expect(actions.map((a: any) => ({ id: a.id, by: a.actionDoneBy, afterMs: a.actionDoneAtMs - a.raisedAtMs, late: a.actionLate }))).toEqual([
      { id: onTime.id, by: crewName, afterMs: onTimeDoneAtMs - onTime.raisedAtMs, late: false },
      { id: late.id, by: crewName, afterMs: lateDoneAtMs - late.raisedAtMs, late: true },
    ]);
    // 90 s is within the site's 3 minutes; 3 min 2 s + 2 min is not.
    expect(onTimeDoneAtMs - onTime.raisedAtMs).toBeLessThan(180_000);
    expect(lateDoneAtMs - late.raisedAtMs).toBeGreaterThan(180_000);
  });
});

describe('CSV exports carry the configuration changes', () => {
  it('configuration-changes.csv: one row per switch, its columns as the README lists them, site time beside UTC', async () => {
    const res = await cp.request('GET', `/api/export/configuration-changes.csv?${window()}`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/csv/);
    const { header, rows } = csv(await res.text());
    expect(header).toEqual(readmeColumns('configuration-changes'));
    expect(rows.map((r) => [r.structure, r.from, r.to, r.reason, r.by, r.alert_id, r.alert_label, r.signalled_overdue, r.note])).toEqual([
      ['Quayside LED wall', 'raised', 'lowered', 'action done', crewName, String(onTime.id), 'Lower the screen', 'no', 'Wall down on its stops.'],
      ['Quayside LED wall', 'lowered', 'raised', 'by hand', cpName, '', '', '', 'Wind down for ten minutes; wall raised again.'],
      ['Quayside LED wall', 'raised', 'lowered', 'action done', crewName, String(late.id), 'Lower the screen', 'yes', ''],
    ]);
    for (const r of rows) expect(r.time_local).toBe(intlSiteTime(Date.parse(r.time_utc!)));
    expect(Date.parse(rows[0]!.time_utc!)).toBe(onTimeDoneAtMs);
    // Minutes from the alert to Done, to 0.1 min (the alert came with one of the readings before the 90 s wait).
    for (const [row, doneAtMs, alert] of [
      [rows[0]!, onTimeDoneAtMs, onTime],
      [rows[2]!, lateDoneAtMs, late],
    ] as const) {
      expect(row.after_alert_min).toMatch(/^\d+\.\d$/);
      expect(Math.abs(Number(row.after_alert_min) - (doneAtMs - alert.raisedAtMs) / 60_000)).toBeLessThanOrEqual(0.05 + 1e-9);
    }
  });

  it('alerts.csv keeps its columns and adds the action’s at the end, as the README lists them', async () => {
    const { header, rows } = csv(await (await cp.request('GET', `/api/export/alerts.csv?${window()}`)).text());
    expect(header).toEqual(readmeColumns('alerts'));
    expect(header.slice(0, 17)).toEqual(['id', 'kind', 'structure', 'sensor', 'level', 'label', 'raised_local', 'raised_utc', 'gust_mps', 'utilization_pct', 'acknowledged_local', 'acknowledged_utc', 'acknowledged_by', 'note', 'cleared_local', 'cleared_utc', 'action']);
    const lateRow = rows.find((r) => r.id === String(late.id))!;
    expect(lateRow).toMatchObject({ move_to_configuration: 'lowered', action_done_by: crewName, action_late: 'yes', action_done_local: intlSiteTime(lateDoneAtMs), overdue_local: intlSiteTime(overdueAtMs) });
    expect(Date.parse(lateRow.overdue_utc!)).toBe(overdueAtMs);
    expect(rows.find((r) => r.id === String(onTime.id))).toMatchObject({ action_late: 'no', action_done_by: crewName, overdue_utc: '' });
  });

  it('level-changes.csv adds the configuration each change was assessed in, as the README lists it', async () => {
    const { header, rows } = csv(await (await cp.request('GET', `/api/export/level-changes.csv?${window()}`)).text());
    expect(header).toEqual(readmeColumns('level-changes'));
    const raises = rows.filter((r) => r.structure === 'Quayside LED wall' && r.event === 'raised');
    // Both spells rose in the raised wall; the drop after the first came in the lowered one.
    expect(raises.every((r) => r.configuration === 'raised')).toBe(true);
    const drop = rows.find((r) => r.structure === 'Quayside LED wall' && r.event === 'lowered')!;
    expect(drop.configuration).toBe('lowered');
  });
});

describe('the forecast check in the configuration it stands in and the one its plan moves it to', () => {
  it('gives the level now (lowered) and, as the lowered wall is where the plan leads, no second configuration', async () => {
    const s = await liveScreen();
    expect(s.configuration).toBe('lowered');
    const answer = await ok(cp.json('POST', '/api/forecast', { text: 'time,gust\n2026-08-09T12:00Z,13\n2026-08-09T13:00Z,16', unit: 'm/s' }));
    const i = answer.structures.findIndex((x: any) => x.id === screenId);
    const structure = answer.structures[i];
    expect(structure.configuration).toBe('lowered');
    expect(structure.configurations.map((c: any) => [c.name, c.current])).toEqual([
      ['raised', false],
      ['lowered', true],
    ]);
    expect(structure.levels.map((l: any) => l.moveToConfiguration)).toEqual([null, 'lowered', null]);
    // Ladders: limit·√fraction (design §2.6), each configuration at the site's density.
    const rho = s.airDensityKgM3;
    const raisedLimit = 14.75 * Math.sqrt(1.225 / rho);
    const loweredLimit = 18.43 * Math.sqrt(1.225 / rho);
    structure.configurations[0].levels.forEach((l: any, j: number) => expect(l.triggerGustMps).toBeCloseTo(raisedLimit * Math.sqrt([0.5, 0.7, 0.9][j]!), 1));
    structure.configurations[1].levels.forEach((l: any, j: number) => expect(l.triggerGustMps).toBeCloseTo(loweredLimit * Math.sqrt([0.5, 0.7, 0.9][j]!), 1));
    // 16 m/s: raised "Stop and clear" (≥ 13.85), lowered "Lower the screen" (15.27 ≤ 16 < 17.3): it is already where its plan leads.
    const row = answer.rows[1].configurations[i];
    expect(row.inConfigurations.map((c: any) => [c.name, c.level])).toEqual([
      ['raised', 3],
      ['lowered', 2],
    ]);
    expect(row.current).toBe(1);
    expect(row.planned).toBeNull();
  });

  it('raised again, a gust that reaches "Lower the screen" shows the lowered wall’s level beside it', async () => {
    await ok(cp.json('POST', `/api/structures/${screenId}/configuration`, { configuration: 'raised', note: 'Raised for the forecast check.' }));
    const answer = await ok(cp.json('POST', '/api/forecast', { text: 'time,gust\n2026-08-09T12:00Z,13\n2026-08-09T13:00Z,11', unit: 'm/s' }));
    const i = answer.structures.findIndex((x: any) => x.id === screenId);
    // 13 m/s: raised level 2 ("Lower the screen": 14.75·√(1.225/1.25)·√0.7 = 12.22 ≤ 13 < 13.86),
    // whose action lowers it → lowered "Prepare" (18.43·√(1.225/1.25)·√0.5 = 12.90 ≤ 13 < 15.27).
    const rho = (await liveScreen()).airDensityKgM3;
    expect(rho).toBe(1.25);
    expect(18.43 * Math.sqrt(1.225 / rho) * Math.sqrt(0.5)).toBeCloseTo(12.9, 2);
    const first = answer.rows[0].configurations[i];
    expect(first.current).toBe(0);
    expect(first.planned).toBe(1);
    expect(first.inConfigurations.map((c: any) => [c.name, c.level])).toEqual([
      ['raised', 2],
      ['lowered', 1],
    ]);
    // 11 m/s: raised "Prepare" only, whose action moves nothing: no second configuration.
    expect(answer.rows[1].configurations[i].inConfigurations[0].level).toBe(1);
    expect(answer.rows[1].configurations[i].planned).toBeNull();
  });
});
