/**
 * The live state of the site, kept current from the server's event stream (GET /api/stream):
 * a snapshot first, then wind, structure and alert events (server/http/routes/liveRoutes.ts).
 *
 * Why a watchdog on top of EventSource's own reconnection: a phone that walks out of Wi-Fi range
 * can keep a half-open TCP connection for minutes with no error event. The server pings every
 * 15 s; when nothing at all has arrived for 35 s the connection is treated as dead, closed and
 * opened again. Until it is back every screen says "reconnecting" and how old its data is, and
 * nothing stale is allowed to look calm.
 */
import { frameRecords } from '../../server/live/frames.ts';
import { byUrgency, listedAlerts, streamEventKinds, type LiveEventMap, type StreamOnlyEventMap } from '../../server/live/liveEvents.ts';
import { foresightFromCell } from '../../server/watch/structureForesight.ts';
import { api, signedOutNow } from './api.ts';
import { fetchSnapshot, type SnapshotAnswer } from './offline.ts';
import { createStore } from './store.ts';
import type { OpenAlert, SensorState, Snapshot, StructureState, WindLog } from './types.ts';

export type Connection = 'connecting' | 'open' | 'reconnecting' | 'offline';

export interface LiveState {
  snapshot: Snapshot | null;
  connection: Connection;
  /** Client clock of the last event of any kind (ping included). */
  lastEventAtMs: number | null;
  /** Client clock of the last snapshot or data event. */
  lastDataAtMs: number | null;
  /** Server clock − client clock, ms: ages are computed against the server's clock. */
  clockOffsetMs: number;
  /**
   * Null while the snapshot came from the server. Otherwise it is the copy the service worker
   * kept (the server could not be reached) and this is the phone's clock when it was kept: the
   * screens show it as OLD with its age, never as current.
   */
  keptAtMs: number | null;
}

/** The server pings every 15 s (liveRoutes.ts); two missed pings and a margin mean a dead link. */
const deadAfterMs = 35_000;
/** Minutes of wind kept for the board's trend line. */
export const trailMinutes = 30;

export const live = createStore<LiveState>({ snapshot: null, connection: 'connecting', lastEventAtMs: null, lastDataAtMs: null, clockOffsetMs: 0, keptAtMs: null });

/** Recent wind per sensor for the trend line: time (server ms), gust and mean in m/s. */
export interface TrailPoint {
  tMs: number;
  gustMps: number | null;
  meanMps: number | null;
}
export const windTrail = createStore<ReadonlyMap<string, TrailPoint[]>>(new Map());

type AlertListener = (alert: OpenAlert & { resignal?: boolean }) => void;
const alertListeners = new Set<AlertListener>();
/** Called for every alert raised or signalled again while the stream is open. */
export function onAlert(listener: AlertListener): () => void {
  alertListeners.add(listener);
  return () => alertListeners.delete(listener);
}

let source: EventSource | null = null;
let watchdog: ReturnType<typeof setInterval> | null = null;
let retryTimer: ReturnType<typeof setTimeout> | null = null;
let running = false;

/** Server time now, estimated from the last offset seen. */
export function serverNow(): number {
  return Date.now() + live.get().clockOffsetMs;
}

function withSnapshot(change: (s: Snapshot) => Snapshot): void {
  const now = Date.now();
  live.update((state) => (state.snapshot ? { ...state, snapshot: change(state.snapshot), lastDataAtMs: now, lastEventAtMs: now } : state));
}

function upsertStructures(list: StructureState[]): void {
  withSnapshot((s) => {
    const byId = new Map(s.structures.map((x) => [x.id, x]));
    for (const st of list) byId.set(st.id, st);
    return { ...s, structures: [...byId.values()].sort(byUrgency) };
  });
}

function upsertAlert(alert: OpenAlert): void {
  withSnapshot((s) => {
    const rest = s.alerts.filter((a) => a.id !== alert.id);
    return { ...s, alerts: listedAlerts([...rest, alert]) };
  });
}

function addTrail(sensor: SensorState): void {
  const tMs = sensor.lastReceivedAtMs;
  if (tMs === null) return;
  windTrail.update((trails) => {
    const next = new Map(trails);
    const list = (next.get(sensor.key) ?? []).filter((p) => p.tMs >= tMs - trailMinutes * 60_000 && p.tMs < tMs);
    list.push({ tMs, gustMps: sensor.currentGustMps, meanMps: sensor.mean10minMps });
    next.set(sensor.key, list);
    return next;
  });
}

function handle(kind: string, data: string): void {
  const now = Date.now();
  if (kind === 'ping') {
    const serverMs = Number(data);
    live.update((s) => ({ ...s, lastEventAtMs: now, clockOffsetMs: Number.isFinite(serverMs) && serverMs > 0 ? serverMs - now : s.clockOffsetMs }));
    return;
  }
  if (kind === 'hello') {
    live.update((s) => ({ ...s, lastEventAtMs: now }));
    return;
  }
  let payload: unknown;
  try {
    payload = JSON.parse(data);
  } catch {
    return;
  }
  switch (kind) {
    case 'snapshot': {
      const snap = payload as StreamOnlyEventMap['snapshot'] satisfies Snapshot;
      live.update((s) => ({ ...s, snapshot: snap, lastDataAtMs: now, lastEventAtMs: now, clockOffsetMs: snap.atMs - now, keptAtMs: null }));
      for (const sensor of snap.sensors) addTrail(sensor);
      break;
    }
    case 'winds': {
      // Once a second: a row per sensor whose wind or state changed (server/live/frames.ts).
      const rows = frameRecords(payload as LiveEventMap['winds']) as Array<Partial<SensorState> & { key: string }>;
      let unknown = false;
      const merged: SensorState[] = [];
      withSnapshot((s) => {
        const byKey = new Map(rows.map((r) => [r.key, r]));
        const known = new Set(s.sensors.map((x) => x.key));
        unknown = rows.some((r) => !known.has(r.key));
        return {
          ...s,
          sensors: s.sensors.map((x) => {
            const row = byKey.get(x.key);
            if (!row) return x;
            const next = { ...x, ...row };
            merged.push(next);
            return next;
          }),
        };
      });
      for (const sensor of merged) addTrail(sensor);
      // A sensor registered since the snapshot: take the register as it is now.
      if (unknown) void refreshSnapshot();
      break;
    }
    case 'structure': {
      upsertStructures([payload as LiveEventMap['structure']]);
      break;
    }
    case 'structures': {
      // Once a second: only the wind-dependent fields of the structures whose shown state moved.
      const updates = frameRecords(payload as LiveEventMap['structures']) as Array<Partial<StructureState> & { id: number }>;
      withSnapshot((s) => {
        const byId = new Map(updates.map((u) => [u.id, u]));
        return { ...s, structures: s.structures.map((x) => (byId.has(x.id) ? { ...x, ...byId.get(x.id)! } : x)).sort(byUrgency) };
      });
      break;
    }
    case 'foresight': {
      // Every few seconds at most: the estimates of the structures whose figures changed.
      const rows = frameRecords(payload as LiveEventMap['foresight']);
      withSnapshot((s) => {
        const byId = new Map(rows.map((r) => [r.id as number, foresightFromCell(r.foresight)]));
        return { ...s, structures: s.structures.map((x) => (byId.has(x.id) ? { ...x, foresight: byId.get(x.id)! } : x)) };
      });
      break;
    }
    case 'register': {
      // A structure, sensor or site setting changed somewhere: take the register as it is now.
      void refreshSnapshot();
      break;
    }
    case 'health': {
      const system = payload as LiveEventMap['health'];
      withSnapshot((s) => ({ ...s, system }));
      break;
    }
    case 'alert': {
      const alert = payload as LiveEventMap['alert'];
      upsertAlert(alert);
      for (const l of alertListeners) l(alert);
      break;
    }
    case 'alert-update': {
      upsertAlert(payload as LiveEventMap['alert-update']);
      break;
    }
    default:
      live.update((s) => ({ ...s, lastEventAtMs: now }));
  }
}

const kinds = streamEventKinds;

function connect(): void {
  if (!running) return;
  source?.close();
  const es = new EventSource('/api/stream');
  source = es;
  live.update((s) => ({ ...s, connection: s.snapshot ? 'reconnecting' : 'connecting' }));
  es.onopen = () => {
    live.update((s) => ({ ...s, connection: 'open', lastEventAtMs: Date.now() }));
    // Through the service worker, which keeps a copy for when the network drops (offline.ts).
    void refreshSnapshot();
  };
  es.onerror = () => {
    if (source !== es) return;
    live.update((s) => ({ ...s, connection: navigator.onLine === false ? 'offline' : 'reconnecting' }));
    // Opened with no way to the server: the copy the service worker kept, shown as old.
    if (!live.get().snapshot) void refreshSnapshot();
    // CLOSED means the browser gave up (an HTTP error such as 401): retry ourselves, checking the
    // session first so a signed-out phone goes to the sign-in screen instead of looping.
    if (es.readyState === EventSource.CLOSED) scheduleRetry();
  };
  for (const kind of kinds) es.addEventListener(kind, (e) => handle(kind, (e as MessageEvent<string>).data));
}

function scheduleRetry(): void {
  if (retryTimer !== null || !running) return;
  retryTimer = setTimeout(() => {
    retryTimer = null;
    // 401 here tells the app the session is gone (api.ts); anything else: try the stream again.
    fetchSnapshot()
      .then((answer) => {
        if (answer.keptAtMs === null) return connect();
        // Still no server: the kept copy (if it is newer than what is shown), and wait again.
        takeSnapshot(answer);
        scheduleRetry();
      })
      .catch((err: unknown) => {
        if ((err as { status?: number }).status === 401) signedOutNow();
        scheduleRetry();
      });
  }, 3_000);
}

/**
 * Takes a fresh snapshot (GET /api/live). The stream announces changes of state, not changes of
 * the register: a structure or sensor added, edited or retired reaches an open board through
 * this — after the change on the phone that made it, on opening the board, and once a minute.
 */
export async function refreshSnapshot(): Promise<void> {
  try {
    takeSnapshot(await fetchSnapshot());
  } catch (err) {
    if ((err as { status?: number }).status === 401) signedOutNow();
    // The stream's own snapshot stands; a failed refresh changes nothing on screen.
  }
}

/**
 * A snapshot from GET /api/live. A kept copy (the service worker's, the server unreachable) never
 * replaces live data: it is taken only while the stream is down and when it is newer than what is
 * shown, with its age from when it was kept and the server's clock as it was then, so every age
 * on screen (a sensor's last reading…) counts from the real time and reads as old.
 */
function takeSnapshot(answer: SnapshotAnswer): void {
  const snap = answer.snapshot;
  const now = Date.now();
  if (answer.keptAtMs === null) {
    live.update((s) => ({ ...s, snapshot: snap, lastDataAtMs: s.connection === 'open' ? now : s.lastDataAtMs, clockOffsetMs: snap.atMs - now, keptAtMs: null }));
    return;
  }
  const keptAtMs = answer.keptAtMs;
  live.update((s) => {
    if (s.connection === 'open' || (s.snapshot !== null && s.snapshot.atMs >= snap.atMs)) return s;
    return { ...s, snapshot: snap, lastDataAtMs: keptAtMs, clockOffsetMs: snap.atMs - keptAtMs, keptAtMs };
  });
  for (const sensor of snap.sensors) addTrail(sensor);
}

/** How often the register is re-read while the stream runs (see refreshSnapshot). */
const snapshotRefreshMs = 60_000;
let refreshTimer: ReturnType<typeof setInterval> | null = null;

/** Starts following the site (after sign-in). Seeds the trend lines from the last 30 minutes. */
export function startLive(): void {
  if (running) return;
  running = true;
  connect();
  watchdog = setInterval(() => {
    const s = live.get();
    if (s.connection === 'open' && s.lastEventAtMs !== null && Date.now() - s.lastEventAtMs > deadAfterMs) {
      live.update((x) => ({ ...x, connection: 'reconnecting' }));
      connect();
    }
  }, 5_000);
  refreshTimer = setInterval(() => {
    if (live.get().connection === 'open') void refreshSnapshot();
  }, snapshotRefreshMs);
  void seedTrail();
}

export function stopLive(): void {
  running = false;
  source?.close();
  source = null;
  if (watchdog) clearInterval(watchdog);
  if (refreshTimer) clearInterval(refreshTimer);
  refreshTimer = null;
  if (retryTimer) clearTimeout(retryTimer);
  watchdog = null;
  retryTimer = null;
  live.set({ snapshot: null, connection: 'connecting', lastEventAtMs: null, lastDataAtMs: null, clockOffsetMs: 0, keptAtMs: null });
  windTrail.set(new Map());
}

async function seedTrail(): Promise<void> {
  try {
    const to = Date.now();
    const log = await api<WindLog>(`/api/log/wind?from=${to - trailMinutes * 60_000}&to=${to + 60_000}&points=120`);
    windTrail.update((trails) => {
      const next = new Map(trails);
      for (const s of log.sensors) {
        const seeded: TrailPoint[] = s.series.tMs.map((t, i) => ({ tMs: t, gustMps: s.series.gustMps[i] ?? null, meanMps: s.series.meanMps[i] ?? null }));
        const newer = (next.get(s.key) ?? []).filter((p) => p.tMs > (seeded.at(-1)?.tMs ?? 0));
        next.set(s.key, [...seeded, ...newer]);
      }
      return next;
    });
  } catch {
    // The trend line is a nicety: without history it starts from the live readings.
  }
}

// The phone knows before the stream does: drop the dead connection at once and say so, and
// reconnect as soon as the network is back.
window.addEventListener('offline', () => {
  if (!running) return;
  source?.close();
  source = null;
  live.update((s) => ({ ...s, connection: 'offline' }));
});
window.addEventListener('online', () => {
  if (running && live.get().connection !== 'open') connect();
});
