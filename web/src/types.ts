/**
 * The shapes the API answers with. Taken from the server's own types (type-only imports, erased
 * from the build) so that a field renamed on the server fails the web type check instead of
 * showing "undefined" on a phone.
 */
import type { OpenAlert, SensorState, StructureState, Watch } from '../../server/watch/watch.ts';
import type { AssessmentReport } from '../../server/engine/assess.ts';
import type { RequiredBallast } from '../../server/engine/stability.ts';
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
import type { ForecastPrediction } from '../../server/levels/predictLevels.ts';
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
};

/** GET /api/site */
export interface SiteView {
  id: number;
  name: string;
  altitudeM: number;
  terrainCategory: string;
  timeZone: string;
  airDensityMode: 'isa' | 'measured' | 'fixed';
  fixedAirDensityKgM3: number | null;
  heightReductionEnabled: boolean;
  directionalEnabled: boolean;
  directionSectorHalfWidthDeg: number;
  deadBandFraction: number;
  holdTimeMs: number;
  defaultLevels: LevelDefinition[];
  createdAtMs: number;
  updatedAtMs: number;
}

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
  structures: Array<{ id: number; name: string; referenceHeightM: number; levels: Array<{ level: number; label: string; triggerGustMps: number }> }>;
  /** Structures the check could not cover, and why. */
  notChecked: Array<{ id: number; name: string; reason: string }>;
  rows: Array<ForecastPrediction & { meanMps: number | null; dirFromDeg: number | null }>;
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
