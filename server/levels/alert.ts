/**
 * Alert records (design §2.4): every escalation raises one, with the level's action text; sensor
 * trouble and a structure without data raise the same record with another `kind`. Records are
 * plain immutable values; storing and sending them is the server's job.
 *
 * The raise itself counts as the first signal (`lastSignalledAtMs = raisedAtMs`); an unacknowledged
 * alert is signalled again on a schedule (see `resignalDue`).
 */
import type { LevelDefinition } from './levelDefinition.ts';
import type { LevelEvent } from './stepLevel.ts';

/**
 * - 'level': a structure reached a higher level.
 * - 'no-data': a structure has no live governing sensor (shown as "no data", never "fine").
 * - 'sensor-silent': a sensor sent nothing for longer than its timeout (design default 30 s).
 * - 'sensor-implausible': a sensor sent values outside the plausible range.
 * - 'sensor-clock': a sensor's time stamps are more than 10 s off the server's clock (clockOffset.ts).
 */
export const alertKinds = ['level', 'no-data', 'sensor-silent', 'sensor-implausible', 'sensor-clock'] as const;
export type AlertKind = (typeof alertKinds)[number];

export interface Acknowledgement {
  /** Name of the person who acknowledged, as they gave it (trimmed). */
  readonly by: string;
  /** What they did or saw, or null. */
  readonly note: string | null;
  /** When, ms since the Unix epoch. */
  readonly atMs: number;
}

export interface Alert {
  readonly kind: AlertKind;
  /** Level reached (kind 'level'), else null. */
  readonly level: number | null;
  /** Short title a crew reads first. */
  readonly label: string;
  /** What to do, in plain words. */
  readonly actionText: string;
  /** When raised, ms since the Unix epoch. */
  readonly raisedAtMs: number;
  /** Gust that raised it in m/s (kind 'level'), else null. */
  readonly gustMps: number | null;
  /** The sensor concerned (sensor kinds), else null. */
  readonly sensorKey: string | null;
  /** Last time the alert was signalled (raised or re-signalled), ms since the epoch. */
  readonly lastSignalledAtMs: number;
  readonly acknowledgement: Acknowledgement | null;
}

type EscalatedEvent = Extract<LevelEvent, { type: 'escalated' | 'de-escalated' }>;
type NoDataEvent = Extract<LevelEvent, { type: 'no-data' | 'data-restored' }>;

/**
 * The alert an escalation raises, carrying the label and action text of the level reached.
 * Throws a RangeError if the event is not an escalation or names a level the list does not have.
 */
export function escalationAlert(event: EscalatedEvent, levels: readonly LevelDefinition[]): Alert {
  if (event.type !== 'escalated') {
    throw new RangeError(`escalationAlert: event.type must be 'escalated', got '${event.type}'`);
  }
  const definition = levels[event.toLevel - 1];
  if (!Number.isInteger(event.toLevel) || definition === undefined) {
    throw new RangeError(
      `escalationAlert: event.toLevel must be an integer in [1, ${levels.length}], got ${event.toLevel}`,
    );
  }
  return {
    kind: 'level',
    level: event.toLevel,
    label: definition.label,
    actionText: definition.actionText,
    raisedAtMs: event.atMs,
    gustMps: event.gustMps,
    sensorKey: null,
    lastSignalledAtMs: event.atMs,
    acknowledgement: null,
  };
}

export const noDataActionText =
  'No live wind reading reaches this structure. Its level is held, not lowered: treat the wind as ' +
  'unknown, not calm. Check the anemometers and the gateway, watch the wind by hand (a handheld ' +
  'anemometer) and follow the wind plan until readings return.';

/** The alert a structure raises when it loses its last live governing sensor. */
export function noDataAlert(event: NoDataEvent): Alert {
  if (event.type !== 'no-data') {
    throw new RangeError(`noDataAlert: event.type must be 'no-data', got '${event.type}'`);
  }
  return {
    kind: 'no-data',
    level: null,
    label: 'No wind data',
    actionText: noDataActionText,
    raisedAtMs: event.atMs,
    gustMps: null,
    sensorKey: null,
    lastSignalledAtMs: event.atMs,
    acknowledgement: null,
  };
}

const sensorAlertTexts: Readonly<Record<'sensor-silent' | 'sensor-implausible', { label: string; actionText: string }>> = {
  'sensor-silent': {
    label: 'Sensor silent',
    actionText:
      'This anemometer has sent nothing for longer than its timeout. Check its power, mounting and ' +
      'connection. Structures that take their wind from it have one reading fewer; if it was their ' +
      'only one they show "no data".',
  },
  'sensor-implausible': {
    label: 'Sensor readings implausible',
    actionText:
      'This anemometer is sending values that cannot be right. Its readings are not used. Check it ' +
      'for damage, icing, a loose mounting or a wrong unit setting.',
  },
};

/** The alert a sensor raises when it goes silent or sends implausible values. */
export function sensorAlert(args: {
  kind: 'sensor-silent' | 'sensor-implausible';
  sensorKey: string;
  raisedAtMs: number;
}): Alert {
  const { kind, sensorKey, raisedAtMs } = args;
  const texts = sensorAlertTexts[kind];
  if (texts === undefined) {
    throw new RangeError(`sensorAlert: kind must be 'sensor-silent' or 'sensor-implausible', got '${String(kind)}'`);
  }
  if (typeof sensorKey !== 'string' || sensorKey.length === 0) {
    throw new RangeError(`sensorAlert: sensorKey must be a non-empty string, got '${String(sensorKey)}'`);
  }
  if (!Number.isFinite(raisedAtMs)) {
    throw new RangeError(`sensorAlert: raisedAtMs must be a finite time in ms since the epoch, got ${raisedAtMs}`);
  }
  return {
    kind,
    level: null,
    label: texts.label,
    actionText: texts.actionText,
    raisedAtMs,
    gustMps: null,
    sensorKey,
    lastSignalledAtMs: raisedAtMs,
    acknowledgement: null,
  };
}
