/**
 * POST /api/chance (design.md 2.7, contract): the public chance calculator, against the real
 * server (its origin, content-type and CSRF middleware included). The 200 answer is checked
 * against a value worked by hand from the formulas' sources: S. O. Rice, Bell System Technical
 * Journal 23-24 (1944-45), N = ν T exp(−(x − U)²/(2σ²)), P = 1 − e^−N; A. G. Davenport, Proc.
 * ICE 28 (1964), peak U + g σ, g = √(2 ln νT) + 0.5772/√(2 ln νT) — from memory (standard results).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiClient, adminPassword, adminUsername, startTestServer, type TestServer } from '../helpers/testServer.ts';

let ts: TestServer;
let admin: ApiClient;

beforeAll(async () => {
  ts = await startTestServer();
  admin = new ApiClient(ts.baseUrl);
  expect((await admin.signIn(adminUsername, adminPassword)).status).toBe(200);
});
afterAll(async () => ts.stop());

async function post(body: unknown, headers: Record<string, string> = {}): Promise<{ status: number; json: any }> {
  const res = await fetch(`${ts.baseUrl}/api/chance`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', ...headers },
    body: typeof body === 'string' ? body : JSON.stringify(body),
  });
  const text = await res.text();
  return { status: res.status, json: text ? JSON.parse(text) : null };
}

const example = { meanMps: 10, sigmaMps: 2, thresholdMps: 16, minutes: 10, upcrossingRateHz: 0.2 };

describe('POST /api/chance answers the contract', () => {
  it('16 m/s within 10 minutes at U 10 m/s, σ 2 m/s, ν 0.2 Hz: P 0.7363, N 1.3331, peak 16.56 m/s (worked by hand)', async () => {
    // T = 10 × 60 = 600 s; νT = 120; (16 − 10)²/(2 × 2²) = 4.5; e^−4.5 = 0.011109;
    // N = 120 × 0.011109 = 1.333080; P = 1 − e^−1.333080 = 0.736336.
    // g = √(2 ln 120) + 0.5772/√(2 ln 120) = 3.094347 + 0.186534 = 3.280881; peak = 10 + 2g = 16.561761.
    const { status, json } = await post(example);
    expect(status).toBe(200);
    expect(json.probability).toBeCloseTo(0.736336, 5);
    expect(json.expectedUpcrossings).toBeCloseTo(1.33308, 5);
    expect(json.expectedPeakGustMps).toBeCloseTo(16.561761, 5);
    expect(json.peakFactor).toBeCloseTo(3.280881, 5);
    expect(json.durationS).toBe(600);
  });

  it('the same at 30 minutes: P 0.9817, peak 17.20 m/s; and P = 1 for a level at or below the mean', async () => {
    // νT = 360; N = 360 × 0.011109 = 3.999239; P = 0.981670; g = 3.431065 + 0.168228 = 3.599293.
    const longer = await post({ ...example, minutes: 30 });
    expect(longer.status).toBe(200);
    expect(longer.json.probability).toBeCloseTo(0.98167, 5);
    expect(longer.json.expectedPeakGustMps).toBeCloseTo(17.198586, 5);
    const atMean = await post({ ...example, thresholdMps: 10 });
    expect(atMean.json.probability).toBe(1);
    expect(atMean.json.expectedUpcrossings).toBeCloseTo(120, 9);
  });

  it('accepts the ends of the ranges: 1 and 180 minutes, a calm mean of 0 m/s', async () => {
    expect((await post({ ...example, minutes: 1 })).status).toBe(200);
    expect((await post({ ...example, minutes: 180 })).status).toBe(200);
    const calm = await post({ ...example, meanMps: 0, thresholdMps: 4 });
    expect(calm.status).toBe(200);
    // N = 120 e^(−16/8) = 120 × 0.135335 = 16.24; P = 1 − e^−16.24 ≈ 1 − 8.9e-8.
    expect(calm.json.expectedUpcrossings).toBeCloseTo(16.24023, 4);
  });
});

describe('POST /api/chance refuses invalid input, naming every offending field', () => {
  it('an empty body names all five fields as required', async () => {
    const { status, json } = await post({});
    expect(status).toBe(400);
    expect(json.error).toBe('invalid input');
    expect(json.issues.map((issue: { path: string }) => issue.path).sort()).toEqual(['meanMps', 'minutes', 'sigmaMps', 'thresholdMps', 'upcrossingRateHz']);
    for (const issue of json.issues) expect(issue.message).toBe('is required (a number)');
  });

  it('every wrong field at once: a negative speed, σ 0, a number sent as text, 181 minutes, ν 0, and an unknown field', async () => {
    const { status, json } = await post({ meanMps: -1, sigmaMps: 0, thresholdMps: '16', minutes: 181, upcrossingRateHz: 0, seconds: 5 });
    expect(status).toBe(400);
    const byPath = new Map<string, string>(json.issues.map((issue: { path: string; message: string }) => [issue.path, issue.message]));
    expect([...byPath.keys()].sort()).toEqual(['meanMps', 'minutes', 'seconds', 'sigmaMps', 'thresholdMps', 'upcrossingRateHz']);
    expect(byPath.get('meanMps')).toBe('must be ≥ 0 m/s');
    expect(byPath.get('sigmaMps')).toBe('must be > 0 m/s');
    expect(byPath.get('thresholdMps')).toMatch(/number/);
    expect(byPath.get('minutes')).toBe('must be at most 180 minutes');
    expect(byPath.get('upcrossingRateHz')).toBe('must be > 0 Hz');
    expect(byPath.get('seconds')).toMatch(/not a known field/);
  });

  it.each([
    ['minutes below 1', { ...example, minutes: 0.5 }, 'minutes', 'must be at least 1 minute'],
    ['a negative threshold', { ...example, thresholdMps: -3 }, 'thresholdMps', 'must be ≥ 0 m/s'],
    ['a negative σ', { ...example, sigmaMps: -2 }, 'sigmaMps', 'must be > 0 m/s'],
    ['a negative ν', { ...example, upcrossingRateHz: -0.2 }, 'upcrossingRateHz', 'must be > 0 Hz'],
    ['a speed above the sensor range', { ...example, meanMps: 121 }, 'meanMps', 'must be ≤ 120 m/s'],
    ['null for a number', { ...example, minutes: null }, 'minutes', null],
  ])('%s is named', async (_, body, path, message) => {
    const { status, json } = await post(body);
    expect(status).toBe(400);
    expect(json.issues).toHaveLength(1);
    expect(json.issues[0].path).toBe(path);
    if (message) expect(json.issues[0].message).toBe(message);
    else expect(json.issues[0].message).toMatch(/number/);
  });

  it('a body that is not JSON, or not an object, is refused as a whole', async () => {
    expect(await post('{"meanMps": ')).toEqual({ status: 400, json: { error: 'invalid input', issues: [{ path: '', message: 'body is not valid JSON' }] } });
    const list = await post([1, 2, 3]);
    expect(list.status).toBe(400);
    expect(list.json.issues[0].path).toBe('');
  });
});

describe('POST /api/chance is public and stores nothing, like /api/assess', () => {
  it('answers a page on another site (no origin check: it changes nothing)', async () => {
    const { status } = await post(example, { origin: 'https://tickets.elsewhere.example', 'sec-fetch-site': 'cross-site' });
    expect(status).toBe(200);
  });

  it('answers a signed-in browser without the CSRF token (exempt like the other calculator)', async () => {
    const res = await admin.request('POST', '/api/chance', example, { 'x-csrf-token': '' });
    expect(res.status).toBe(200);
    // The same request to a route that changes something is refused.
    expect((await admin.request('POST', '/api/sensors', { key: 'x' }, { 'x-csrf-token': 'wrong' })).status).toBe(403);
  });

  it('still wants its body as application/json (415 otherwise)', async () => {
    const res = await fetch(`${ts.baseUrl}/api/chance`, { method: 'POST', headers: { 'content-type': 'text/plain' }, body: JSON.stringify(example) });
    expect(res.status).toBe(415);
  });

  it('leaves the audit trail as it was', async () => {
    // The answer's fromMs/toMs follow the clock (the last 24 hours); the entries must not change.
    const entries = async () => {
      const { status, body } = await admin.json<Record<string, unknown>>('GET', '/api/log/audit');
      expect(status).toBe(200);
      const { fromMs: _from, toMs: _to, ...rest } = body;
      return rest;
    };
    const before = await entries();
    expect(JSON.stringify(before)).toContain('test-admin');
    expect((await post(example)).status).toBe(200);
    expect((await post({})).status).toBe(400);
    expect(await entries()).toEqual(before);
  });
});
