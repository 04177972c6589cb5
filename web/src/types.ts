/**
 * The shapes the API answers with. Taken from the server's own types (type-only imports, erased
 * from the build) so that a field renamed on the server fails the web type check instead of
 * showing "undefined" on a phone.
 */
import type { OpenAlert, SensorState, StructureState, Watch } from '../../server/watch/watch.ts';
import type { AssessmentReport } from '../../server/engine/assess.ts';
import type { RequiredBallast } from '../../server/engine/requiredBallast.ts';
import type { StructureRecord, StructureKind } from '../../server/engine/record.ts';
import type { DaySummary, StructureDay, SensorDay } from '../../server/storage/daySummary.ts';
import type { WindSeries, StructureSeries } from '../../server/storage/logQueries.ts';
import type { StructureView } from '../../server/register/structures.ts';
import type { GatewayView } from '../../server/register/gateways.ts';
import type { SensorRecord } from '../../server/register/sensors.ts';
import type { Person } from '../../server/auth/accounts.ts';
import type { Role } from '../../server/auth/roles.ts';
import type { LevelDefinition, LevelTrigger } from '../../server/levels/levelDefinition.ts';
import type { BrokerRefusal, RefusalKind, RefusalReason, RejectionCount } from '../../server/ingest/rejections.ts';
import type { ChecklistStep, ChecklistStepId, SetupChecklist } from '../../server/register/setupChecklist.ts';
import type { LinkAddress } from '../../server/http/routes/accessRoutes.ts';
import type { ForecastPrediction } from '../../server/foresight/predictLevels.ts';
import type { alertsTable } from '../../db/schema.ts';

export type {
  OpenAlert,
  SensorState,
  StructureState,
  AssessmentReport,
  StructureRecord,
  StructureKind,
  DaySummary,
  StructureDay,
  SensorDay,
  WindSeries,
  StructureSeries,
  StructureView,
  GatewayView,
  SensorRecord,
  Person,
  Role,
  LevelDefinition,
  LevelTrigger,
  RejectionCount,
  BrokerRefusal,
  RefusalKind,
  RefusalReason,
  ChecklistStep,
  ChecklistStepId,
  SetupChecklist,
  LinkAddress,
  ForecastPrediction,
};

export type Snapshot = ReturnType<Watch['snapshot']>;

/** GET /api/session */
export type Session =
  | { signedIn: false; setupPending: boolean }
  | { signedIn: true; kind: 'person' | 'link'; name: string; role: Role; person: Person | null; csrfToken: string };

/** One field problem of a 400 answer. */
export interface FieldIssue {
  path: string;
  message: string;
}

/** POST /api/assess with the extensions `levels`, `designGustMps` (and `ballastXM`, `ballastYM`) and `frontAzimuthDeg`. */
export type AssessAnswer = AssessmentReport & {
  levels?: Array<{ level: number; label: string; trigger: LevelTrigger; triggerGustMps: number | null }>;
  levelOrderProblems?: FieldIssue[];
  requiredBallast?: { designGustMps: number; xM: number; yM: number } & RequiredBallast;
  /** Issue 14: each configuration at the same gust, the one as registered first (a record with configurations). */
  configurations?: AssessConfiguration[];
};

/** GET /api/site: the settings' one schema with the row's id and times (server/register/siteSettings.ts). */
export type { SiteView } from '../../server/register/siteSettings.ts';

/** GET /api/sensors (one entry) */
export type SensorView = SensorRecord & { topic: string; live: SensorState | null; rejections: RejectionCount[] };

/** GET /api/structures (one entry) */
export type StructureWithLive = StructureView & { live: StructureState | null };

export interface LevelChangeRow {
  id: number;
  structureId: number;
  atMs: number;
  fromLevel: number;
  toLevel: number;
  gustMps: number | null;
  utilization: number | null;
  noData: boolean;
  /** The estimate in force just before a rise (design §2.7): the level it was for, its chance within 10 and 30 min; null when there was none. */
  estimateLevel?: number | null;
  estimateChance10?: number | null;
  estimateChance30?: number | null;
  structureName?: string | null;
}

/** An alert as the log answers it: the table's row. */
export type AlertRow = typeof alertsTable.$inferSelect;

/** GET /api/log/structures/:id */
export interface StructureLog {
  fromMs: number;
  toMs: number;
  structure: { id: number; name: string; kind: string };
  live: StructureState | null;
  series: StructureSeries;
  levelChanges: LevelChangeRow[];
  alerts: AlertRow[];
  /** Issue 14: the structure's configuration switches and overdue signals in the window. */
  configurationChanges?: ConfigurationChangeEntry[];
  overdueSignals?: OverdueSignalEntry[];
}

/** GET /api/log/wind */
export interface WindLog {
  fromMs: number;
  toMs: number;
  sensors: Array<{ key: string; name: string; heightM: number; series: WindSeries }>;
}

/** POST /api/forecast */
export interface ForecastAnswer {
  heightM: number;
  ignoredColumns: string[];
  /** How the table was read: units per column, the date order and why, the time zone. */
  notes: string[];
  /** The order year-last dates were read in, or null when none needed one. */
  dateOrder: 'day-first' | 'month-first' | null;
  structures: Array<{
    id: number;
    name: string;
    referenceHeightM: number;
    levels: Array<{ level: number; label: string; triggerGustMps: number; moveToConfiguration?: string | null }>;
    /** Issue 14: the configuration it stands in now, and every configuration with its ladder. */
    configuration?: string;
    configurations?: ForecastStructureConfiguration[];
  }>;
  /** Structures the check could not cover, and why. */
  notChecked: Array<{ id: number; name: string; reason: string }>;
  /** Issue 14: `configurations`, one entry per structure (in the order of `structures`). */
  rows: Array<ForecastPrediction & { meanMps: number | null; dirFromDeg: number | null; configurations?: ForecastRowConfigurations[] }>;
}

export interface SiteLink {
  id: number;
  label: string;
  createdBy: string;
  createdAtMs: number;
  expiresAtMs: number;
  revokedAtMs: number | null;
}

/** GET /api/refusals */
export interface RefusalsAnswer {
  refusals: BrokerRefusal[];
  total: number;
  droppedGroups: number;
  maxGroups: number;
  sinceMs: number;
  broker: 'embedded' | 'external';
}

// ---------- Configurations and plan actions (design §2.5) ----------
// Written here rather than taken from the server's types: a limit no gust reaches is Infinity on
// the server and null in JSON. The screens read them through web/src/configurationState.ts, which
// checks each one and treats a missing configuration as unknown, never as the one registered.

/** One configuration of a structure in its live state (StructureState.configurations), as registered first. */
export interface LiveConfiguration {
  name: string;
  /** The configuration the structure is in now. */
  current: boolean;
  /** Effective limit gust in this configuration (the lower of calculated and rated), m/s; null: no gust reaches it. */
  limitGustMps: number | null;
  calculatedLimitGustMps: number | null;
  /** Each level's trigger gust in this configuration, m/s, in level order. */
  triggerGustsMps: Array<number | null>;
}

/** The live state's configuration fields (StructureState additions). */
export interface StructureConfigurationFields {
  /** The live configuration's name. */
  configuration?: string;
  /** When it was switched to; null: as registered, never switched. */
  configurationSinceMs?: number | null;
  /** Who switched it (display name). */
  configurationBy?: string | null;
  configurations?: LiveConfiguration[];
}

/** A level alert's plan action (OpenAlert additions). */
export interface AlertActionFields {
  /** The configuration the level's action moves the structure to ("lowered"); null: none. */
  moveToConfiguration?: string | null;
  actionDoneAtMs?: number | null;
  actionDoneBy?: string | null;
  /** When the action is due (raised + the site's actionDueMs); null without an action. */
  actionDueAtMs?: number | null;
  /** When it was signalled again as overdue. */
  overdueAtMs?: number | null;
}

/** A level's configuration action (LevelDefinition addition). */
export interface LevelConfigurationField {
  moveToConfiguration?: string;
}

/** POST /api/structures/:id/configuration */
export interface ConfigurationSwitchAnswer {
  structure: StructureState;
  alert: OpenAlert | null;
}

/** One configuration in the calculator's answer (POST /api/assess `configurations`). */
export interface AssessConfiguration {
  name: string;
  registered?: boolean;
  calculatedLimitGustMps: number | null;
  limitGustMps: number | null;
  limitGovernedBy?: string;
  governingText?: string;
  effectiveUtilization?: number | null;
  margin?: number | null;
  levels?: Array<{ level: number; label: string; triggerGustMps: number | null }>;
}

// ---------- The log of the plan's actions (issue 14; design §2.5, §2.8) ----------

/** GET /api/log/configurations: configuration switches and overdue signals in the window. */
export interface ConfigurationLog {
  fromMs: number;
  toMs: number;
  configurationChanges: ConfigurationChangeEntry[];
  overdueSignals: OverdueSignalEntry[];
}

/** POST /api/forecast, per structure: every configuration with its ladder (the one it stands in now marked). */
export interface ForecastStructureConfiguration {
  name: string;
  current: boolean;
  referenceHeightM: number;
  limitGustMps: number;
  levels: Array<{ level: number; label: string; triggerGustMps: number }>;
}

/** POST /api/forecast, per row and structure: the level in each configuration and the one the plan moves it to (indices into the structure's configurations). */
export interface ForecastRowConfigurations {
  inConfigurations: Array<{ name: string; gustAtStructureMps: number | null; level: number | null }>;
  current: number;
  planned: number | null;
}

export type { ConfigurationChangeEntry, OverdueSignalEntry } from '../../server/storage/configurationLog.ts';
import type { ConfigurationChangeEntry, OverdueSignalEntry } from '../../server/storage/configurationLog.ts';
