/**
 * The database schema: one file, every table. Timestamps are integer milliseconds since the
 * Unix epoch (`…Ms`); every number carries its unit in its name. Row types are inferred from
 * these tables, never written by hand.
 *
 * The two high-volume tables (`readings`, `wind_minutes`) store speeds as integer centimetres
 * per second (`…Cmps`) and temperatures as tenths of a degree, and are WITHOUT ROWID tables
 * keyed on (sensor, time): a reading costs about 20 bytes on disk instead of about 60 with REAL
 * columns and a rowid index (see DEVELOPERS.md, "storage"). The WITHOUT ROWID clause is added by
 * hand to the generated migration, because drizzle-kit has no option for it.
 */
import { sql } from 'drizzle-orm';
import { index, integer, primaryKey, real, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { roles } from '../server/auth/roles.ts';
import { speedUnits } from '../server/engine/units.ts';
import type { LevelDefinition } from '../server/levels/levelDefinition.ts';
import { sensorModes } from '../server/register/sensors.ts';
import { airDensityModes, forecastSpeedUnits, siteSettingDefaults as siteDefaults, terrainCategories } from '../server/register/siteSettings.ts';

export const sitesTable = sqliteTable('sites', {
  id: integer().primaryKey({ autoIncrement: true }),
  name: text().notNull(),
  altitudeM: real('altitude_m').notNull().default(siteDefaults.altitudeM),
  /** EN 1991-1-4 Table 4.1: '0', 'I', 'II', 'III', 'IV'. */
  terrainCategory: text('terrain_category', { enum: terrainCategories }).notNull().default(siteDefaults.terrainCategory),
  timeZone: text('time_zone').notNull().default(siteDefaults.timeZone),
  /** 'isa' | 'measured' | 'fixed' (design.md 2.1). */
  airDensityMode: text('air_density_mode', { enum: airDensityModes }).notNull().default(siteDefaults.airDensityMode),
  fixedAirDensityKgM3: real('fixed_air_density_kg_m3'),
  /** A height factor below 1 is applied only when this is on (design.md 2.2). */
  heightReductionEnabled: integer('height_reduction_enabled', { mode: 'boolean' }).notNull().default(siteDefaults.heightReductionEnabled),
  directionalEnabled: integer('directional_enabled', { mode: 'boolean' }).notNull().default(siteDefaults.directionalEnabled),
  /** With directional assessment: the directions within ± this many degrees of the mean direction count (design.md 2.2 v2). */
  directionSectorHalfWidthDeg: real('direction_sector_half_width_deg').notNull().default(siteDefaults.directionSectorHalfWidthDeg),
  deadBandFraction: real('dead_band_fraction').notNull().default(siteDefaults.deadBandFraction),
  holdTimeMs: integer('hold_time_ms').notNull().default(siteDefaults.holdTimeMs),
  /** How long after its alert a level's action that moves the structure may wait before it is signalled again as overdue (design §2.5). */
  actionDueMs: integer('action_due_ms').notNull().default(siteDefaults.actionDueMs),
  /** The forecast feed (design §2.7): the address polled, or null for none (server/forecastFeed). */
  forecastFeedUrl: text('forecast_feed_url'),
  /** How often the feed is polled, ms (5 min to 6 h). */
  forecastFeedIntervalMs: integer('forecast_feed_interval_ms').notNull().default(siteDefaults.forecastFeedIntervalMs),
  /** Unit of bare numbers in the feed ('m/s' | 'km/h' | 'kn' | 'mph'), or null when the file states its units. */
  forecastFeedUnit: text('forecast_feed_unit', { enum: forecastSpeedUnits }),
  /** Height the feed's speeds refer to, m (forecasts give 10 m). */
  forecastFeedHeightM: real('forecast_feed_height_m').notNull().default(siteDefaults.forecastFeedHeightM),
  /** The site's default level list (JSON, see server/levels). */
  defaultLevelsJson: text('default_levels_json', { mode: 'json' }).$type<LevelDefinition[]>().notNull(),
  createdAtMs: integer('created_at_ms').notNull(),
  updatedAtMs: integer('updated_at_ms').notNull(),
});

export const sensorsTable = sqliteTable(
  'sensors',
  {
    id: integer().primaryKey({ autoIncrement: true }),
    siteId: integer('site_id').notNull().references(() => sitesTable.id),
    /** The key in the MQTT topic: [a-z0-9-], at most 64 characters (design.md 3). */
    key: text().notNull(),
    name: text().notNull(),
    heightM: real('height_m').notNull(),
    /** Where it stands on the site, in words ("mast by the north gate"), and optionally on a map. */
    location: text().notNull().default(''),
    latDeg: real('lat_deg'),
    lonDeg: real('lon_deg'),
    /** The speed unit its payloads use: 'm/s' | 'km/h' | 'kn' | 'mph'. */
    unit: text({ enum: speedUnits }).notNull().default('m/s'),
    /** 'samples' (raw speed samples; the server computes gust and mean) | 'summaries'. */
    mode: text({ enum: sensorModes }).notNull().default('samples'),
    silenceTimeoutMs: integer('silence_timeout_ms').notNull().default(30_000),
    createdAtMs: integer('created_at_ms').notNull(),
    retiredAtMs: integer('retired_at_ms'),
  },
  (t) => [uniqueIndex('sensors_key_unique').on(t.key)],
);

export const gatewaysTable = sqliteTable(
  'gateways',
  {
    id: integer().primaryKey({ autoIncrement: true }),
    siteId: integer('site_id').notNull().references(() => sitesTable.id),
    name: text().notNull(),
    /** The MQTT username. */
    username: text().notNull(),
    /** scrypt hash, see server/http/auth (format `scrypt$N$r$p$salt$hash`). */
    passwordHash: text('password_hash').notNull(),
    createdAtMs: integer('created_at_ms').notNull(),
    revokedAtMs: integer('revoked_at_ms'),
  },
  (t) => [uniqueIndex('gateways_username_unique').on(t.username)],
);

export const gatewaySensorsTable = sqliteTable(
  'gateway_sensors',
  {
    gatewayId: integer('gateway_id').notNull().references(() => gatewaysTable.id),
    sensorId: integer('sensor_id').notNull().references(() => sensorsTable.id),
  },
  (t) => [primaryKey({ columns: [t.gatewayId, t.sensorId] })],
);

/** Every accepted reading (WITHOUT ROWID; de-duplicated on sensor and time). */
export const readingsTable = sqliteTable(
  'readings',
  {
    sensorId: integer('sensor_id').notNull(),
    tsMs: integer('ts_ms').notNull(),
    /** A sample, or the mean when `gustCmps` is given (a summary). */
    speedCmps: integer('speed_cmps').notNull(),
    gustCmps: integer('gust_cmps'),
    /** Degrees the wind blows from, 0–359. */
    dirDeg: integer('dir_deg'),
    tempDeciC: integer('temp_deci_c'),
    pressurePa: integer('pressure_pa'),
    rhPct: integer('rh_pct'),
    /** Bit 0: arrived in a buffered batch (stored, never used to trigger alerts). */
    flags: integer().notNull().default(0),
  },
  (t) => [primaryKey({ columns: [t.sensorId, t.tsMs] })],
);

/** Per-sensor, per-minute rollups, maintained as readings arrive (WITHOUT ROWID). */
export const windMinutesTable = sqliteTable(
  'wind_minutes',
  {
    sensorId: integer('sensor_id').notNull(),
    minuteMs: integer('minute_ms').notNull(),
    sampleCount: integer('sample_count').notNull(),
    speedSumCmps: integer('speed_sum_cmps').notNull(),
    /** Highest 3-s gust in the minute (or highest reported gust for summaries). */
    maxGustCmps: integer('max_gust_cmps').notNull(),
    /** Sums of unit vectors (sin, cos of the from-direction) for the vector-mean direction. */
    dirSinSum: real('dir_sin_sum').notNull().default(0),
    dirCosSum: real('dir_cos_sum').notNull().default(0),
    dirCount: integer('dir_count').notNull().default(0),
  },
  (t) => [primaryKey({ columns: [t.sensorId, t.minuteMs] })],
);

/** Rejected payloads, counted per sensor key (or topic) and reason. */
export const rejectionsTable = sqliteTable(
  'rejections',
  {
    /** The sensor key from the topic, or '*' when the topic named no sensor. */
    sensorKey: text('sensor_key').notNull(),
    reason: text().notNull(),
    count: integer().notNull(),
    firstAtMs: integer('first_at_ms').notNull(),
    lastAtMs: integer('last_at_ms').notNull(),
    lastDetail: text('last_detail').notNull(),
  },
  (t) => [primaryKey({ columns: [t.sensorKey, t.reason] })],
);

export const structuresTable = sqliteTable('structures', {
  id: integer().primaryKey({ autoIncrement: true }),
  siteId: integer('site_id').notNull().references(() => sitesTable.id),
  name: text().notNull(),
  kind: text().notNull(),
  /** The structure record as registered (engine record, JSON). */
  recordJson: text('record_json', { mode: 'json' }).notNull(),
  /** Azimuth the front faces toward, degrees clockwise from north. */
  orientationDeg: real('orientation_deg').notNull().default(0),
  location: text().notNull().default(''),
  latDeg: real('lat_deg'),
  lonDeg: real('lon_deg'),
  mobile: integer({ mode: 'boolean' }).notNull().default(false),
  /** Sensor keys that govern (JSON array); null = every sensor on the site. */
  sensorKeysJson: text('sensor_keys_json', { mode: 'json' }),
  /** Level list (JSON); null = the site's defaults. */
  levelsJson: text('levels_json', { mode: 'json' }),
  createdAtMs: integer('created_at_ms').notNull(),
  updatedAtMs: integer('updated_at_ms').notNull(),
  retiredAtMs: integer('retired_at_ms'),
});

/** Per-structure, per-minute history of the live assessment. */
export const structureMinutesTable = sqliteTable(
  'structure_minutes',
  {
    structureId: integer('structure_id').notNull(),
    minuteMs: integer('minute_ms').notNull(),
    maxGustCmps: integer('max_gust_cmps').notNull(),
    /** Highest governing utilization in the minute, in ten-thousandths (1 = 10000). */
    maxUtilizationE4: integer('max_utilization_e4').notNull(),
    maxLevel: integer('max_level').notNull(),
  },
  (t) => [primaryKey({ columns: [t.structureId, t.minuteMs] })],
);

export const levelChangesTable = sqliteTable(
  'level_changes',
  {
    id: integer().primaryKey({ autoIncrement: true }),
    structureId: integer('structure_id').notNull(),
    atMs: integer('at_ms').notNull(),
    fromLevel: integer('from_level').notNull(),
    toLevel: integer('to_level').notNull(),
    /** Gust at the structure's height when it changed; null for a no-data change. */
    gustMps: real('gust_mps'),
    utilization: real(),
    noData: integer('no_data', { mode: 'boolean' }).notNull().default(false),
    /**
     * The estimate in force just before a rise (design §2.7): the level it was for (the next one
     * above the level left), and its chance within 10 and 30 minutes; null when there was none.
     */
    estimateLevel: integer('estimate_level'),
    estimateChance10: real('estimate_chance_10'),
    estimateChance30: real('estimate_chance_30'),
  },
  (t) => [index('level_changes_structure_at').on(t.structureId, t.atMs), index('level_changes_at').on(t.atMs)],
);

export const alertsTable = sqliteTable(
  'alerts',
  {
    id: integer().primaryKey({ autoIncrement: true }),
    siteId: integer('site_id').notNull(),
    /** 'level' | 'no-data' | 'sensor-silent' | 'sensor-implausible' | 'sensor-clock'. */
    kind: text().notNull(),
    structureId: integer('structure_id'),
    sensorId: integer('sensor_id'),
    level: integer(),
    label: text().notNull(),
    actionText: text('action_text').notNull().default(''),
    raisedAtMs: integer('raised_at_ms').notNull(),
    gustMps: real('gust_mps'),
    utilization: real(),
    acknowledgedAtMs: integer('acknowledged_at_ms'),
    acknowledgedBy: text('acknowledged_by'),
    acknowledgeNote: text('acknowledge_note'),
    /** When the condition behind it ended (level lowered, sensor back); the record stays. */
    clearedAtMs: integer('cleared_at_ms'),
    /** The configuration the level's action moves the structure to (design §2.5); null when none. */
    moveToConfiguration: text('move_to_configuration'),
    /** When and by whom the action was marked done ("Done: lowered"). */
    actionDoneAtMs: integer('action_done_at_ms'),
    actionDoneBy: text('action_done_by'),
    /** When the action, not done in time, was signalled again as overdue. */
    overdueAtMs: integer('overdue_at_ms'),
  },
  (t) => [index('alerts_raised_at').on(t.raisedAtMs)],
);

/** Every switch of a structure's live configuration (design §2.5): who, when, why. The newest row per structure is its configuration after a restart. */
export const configurationChangesTable = sqliteTable(
  'configuration_changes',
  {
    id: integer().primaryKey({ autoIncrement: true }),
    structureId: integer('structure_id').notNull(),
    atMs: integer('at_ms').notNull(),
    fromName: text('from_name').notNull(),
    toName: text('to_name').notNull(),
    by: text().notNull(),
    note: text(),
    /** The alert whose action this was ("Done"); null for a switch by hand. */
    alertId: integer('alert_id'),
    /** 'action-done' | 'by-hand'. */
    reason: text().notNull(),
  },
  (t) => [index('configuration_changes_structure_at').on(t.structureId, t.atMs), index('configuration_changes_at').on(t.atMs)],
);

export const auditTable = sqliteTable(
  'audit',
  {
    id: integer().primaryKey({ autoIncrement: true }),
    atMs: integer('at_ms').notNull(),
    /** Who: a person's name or id, 'system', 'import'. */
    actor: text().notNull(),
    entity: text().notNull(),
    entityId: text('entity_id').notNull(),
    action: text().notNull(),
    beforeJson: text('before_json', { mode: 'json' }),
    afterJson: text('after_json', { mode: 'json' }),
  },
  (t) => [index('audit_at').on(t.atMs)],
);

/** Small key/value facts about this installation (schema notes, demo seeding done...). */
export const metaTable = sqliteTable('meta', {
  key: text().primaryKey(),
  value: text().notNull(),
  updatedAtMs: integer('updated_at_ms').notNull().default(sql`0`),
});

/** People who sign in. Roles: 'viewer' < 'crew' < 'competent-person' < 'admin'. */
export const peopleTable = sqliteTable(
  'people',
  {
    id: integer().primaryKey({ autoIncrement: true }),
    username: text().notNull(),
    displayName: text('display_name').notNull(),
    role: text({ enum: roles }).notNull(),
    /** scrypt hash (server/auth/password.ts). */
    passwordHash: text('password_hash').notNull(),
    createdAtMs: integer('created_at_ms').notNull(),
    disabledAtMs: integer('disabled_at_ms'),
  },
  (t) => [uniqueIndex('people_username_unique').on(t.username)],
);

/**
 * Signed-in sessions. The cookie holds a random token; only its SHA-256 is stored, so a copy of
 * the database signs nobody in. A session opened through a site link has `siteLinkId` and no person.
 */
export const sessionsTable = sqliteTable(
  'sessions',
  {
    tokenHash: text('token_hash').primaryKey(),
    personId: integer('person_id'),
    siteLinkId: integer('site_link_id'),
    csrfToken: text('csrf_token').notNull(),
    createdAtMs: integer('created_at_ms').notNull(),
    expiresAtMs: integer('expires_at_ms').notNull(),
  },
  (t) => [index('sessions_person').on(t.personId)],
);

/** Read-only links for stewards: a long random token (stored hashed), revocable, with expiry. */
export const siteLinksTable = sqliteTable(
  'site_links',
  {
    id: integer().primaryKey({ autoIncrement: true }),
    tokenHash: text('token_hash').notNull(),
    label: text().notNull(),
    createdBy: text('created_by').notNull(),
    createdAtMs: integer('created_at_ms').notNull(),
    expiresAtMs: integer('expires_at_ms').notNull(),
    revokedAtMs: integer('revoked_at_ms'),
  },
  (t) => [uniqueIndex('site_links_token_unique').on(t.tokenHash)],
);

/**
 * Alert notifications (design §4b, server/notify): webhooks added in the app (each with its own
 * secret and filter), each person's e-mail address and filter, the escalation chain per level,
 * the outbox of deliveries with every attempt, the escalation steps taken, and the acknowledge
 * links already used (single use).
 */
export const notifyWebhooksTable = sqliteTable('notify_webhooks', {
  id: integer().primaryKey({ autoIncrement: true }),
  name: text().notNull(),
  url: text().notNull(),
  /** The HMAC-SHA256 key: shown once when made; kept to sign with. */
  secret: text().notNull(),
  /** `{"kind":"all"}` | `{"kind":"levels","atLeast":n}` | `{"kind":"structures","structureIds":[…]}`. */
  filterJson: text('filter_json', { mode: 'json' }).notNull(),
  enabled: integer({ mode: 'boolean' }).notNull().default(true),
  createdBy: text('created_by').notNull(),
  createdAtMs: integer('created_at_ms').notNull(),
  updatedAtMs: integer('updated_at_ms').notNull(),
});

export const notifyPersonSettingsTable = sqliteTable('notify_person_settings', {
  personId: integer('person_id').primaryKey(),
  email: text(),
  filterJson: text('filter_json', { mode: 'json' }).notNull(),
  updatedAtMs: integer('updated_at_ms').notNull(),
});

/** The escalation chain of one level: steps `[{afterMinutes, personId?, role?}]`, minutes from the alert. */
export const notifyEscalationTable = sqliteTable('notify_escalation', {
  level: integer().primaryKey(),
  stepsJson: text('steps_json', { mode: 'json' }).notNull(),
  updatedBy: text('updated_by').notNull(),
  updatedAtMs: integer('updated_at_ms').notNull(),
});

/** One message to one recipient: the same delivery id on every attempt. */
export const notifyOutboxTable = sqliteTable(
  'notify_outbox',
  {
    id: integer().primaryKey({ autoIncrement: true }),
    deliveryId: text('delivery_id').notNull(),
    /** 'webhook' | 'email' (one module per channel in server/notify/channels). */
    channel: text().notNull(),
    /** Who: 'webhook:env', 'webhook:<id>', 'person:<id>'. */
    target: text().notNull(),
    /** 'alert.raised' | … | 'test'. */
    event: text().notNull(),
    alertId: integer('alert_id'),
    /** What the channel sends (the webhook body text, or the e-mail's parts), fixed when queued. */
    payloadJson: text('payload_json', { mode: 'json' }).notNull(),
    createdAtMs: integer('created_at_ms').notNull(),
    /** 'pending' | 'delivered' | 'failed' (gave up after the last retry). */
    status: text().notNull(),
    attempts: integer().notNull().default(0),
    nextAttemptAtMs: integer('next_attempt_at_ms').notNull(),
    lastError: text('last_error'),
    deliveredAtMs: integer('delivered_at_ms'),
  },
  (t) => [uniqueIndex('notify_outbox_delivery_unique').on(t.deliveryId), index('notify_outbox_status').on(t.status, t.nextAttemptAtMs)],
);

export const notifyAttemptsTable = sqliteTable(
  'notify_attempts',
  {
    id: integer().primaryKey({ autoIncrement: true }),
    outboxId: integer('outbox_id').notNull(),
    atMs: integer('at_ms').notNull(),
    durationMs: integer('duration_ms').notNull(),
    ok: integer({ mode: 'boolean' }).notNull(),
    /** "HTTP 200", "HTTP 500", "timed out after 10 s", "250 Accepted", "connect ECONNREFUSED …". */
    result: text().notNull(),
  },
  (t) => [index('notify_attempts_outbox').on(t.outboxId)],
);

/** Each escalation step taken: an alert not acknowledged in time, sent on to the next person or role. */
export const notifyEscalationsTable = sqliteTable(
  'notify_escalations',
  {
    id: integer().primaryKey({ autoIncrement: true }),
    alertId: integer('alert_id').notNull(),
    step: integer().notNull(),
    atMs: integer('at_ms').notNull(),
    /** 'person:<id>' | 'role:<role>'. */
    target: text().notNull(),
    /** Who it reached, in words ("Ana (rigger) by e-mail", "nobody: no e-mail address set"). */
    reached: text().notNull(),
  },
  (t) => [uniqueIndex('notify_escalations_alert_step').on(t.alertId, t.step), index('notify_escalations_at').on(t.atMs)],
);

/** Acknowledge links already used (single use), by their nonce. */
export const notifyUsedTokensTable = sqliteTable('notify_used_tokens', {
  nonce: text().primaryKey(),
  alertId: integer('alert_id').notNull(),
  usedAtMs: integer('used_at_ms').notNull(),
});

/**
 * Web Push subscriptions (design §4b, server/notify/channels/push.ts): one row per browser (the
 * push service's endpoint is unique to it), owned by the person who subscribed it there, with a
 * label they chose ("my phone"). The keys are the browser's: `p256dh` its P-256 public key and
 * `auth` its 16-byte secret (RFC 8291 §3), base64url. A row the push service answers 404/410 for
 * is removed.
 */
export const notifyPushSubscriptionsTable = sqliteTable(
  'notify_push_subscriptions',
  {
    id: integer().primaryKey({ autoIncrement: true }),
    personId: integer('person_id').notNull(),
    endpoint: text().notNull(),
    p256dh: text().notNull(),
    auth: text().notNull(),
    label: text().notNull(),
    userAgent: text('user_agent'),
    createdAtMs: integer('created_at_ms').notNull(),
    updatedAtMs: integer('updated_at_ms').notNull(),
    /** The newest push the service accepted for it (null: none yet). */
    lastDeliveredAtMs: integer('last_delivered_at_ms'),
  },
  (t) => [uniqueIndex('notify_push_subscriptions_endpoint').on(t.endpoint), index('notify_push_subscriptions_person').on(t.personId)],
);

/**
 * Every poll of the forecast feed (design §2.7, server/forecastFeed): when, what address, what
 * the server answered, whether the body could be read and why not, the rows read (the forecast
 * table's rows in SI units, JSON) and how they were read. The newest successful poll is the
 * forecast the board shows; the log compares each hour with the last poll made before it.
 */
export const forecastPollsTable = sqliteTable(
  'forecast_polls',
  {
    id: integer().primaryKey({ autoIncrement: true }),
    /** When the poll started. */
    atMs: integer('at_ms').notNull(),
    url: text().notNull(),
    /** The HTTP status, or null when no answer came (refused, timed out). */
    httpStatus: integer('http_status'),
    ok: integer({ mode: 'boolean' }).notNull(),
    /** Why it failed, in words ("HTTP 500", "timed out after 15 s", "Line 3, column 2 (gust): …"); null when ok. */
    error: text(),
    /** 'csv' | 'json', or null when no body was read. */
    format: text(),
    /** The rows read: `[{line, timeMs, meanMps, gustMps, dirFromDeg}]`; null when it failed. */
    rowsJson: text('rows_json', { mode: 'json' }),
    /** How the body was read (sentences), or every problem found when it could not be. */
    notesJson: text('notes_json', { mode: 'json' }).notNull(),
    bytes: integer(),
    durationMs: integer('duration_ms').notNull(),
  },
  (t) => [index('forecast_polls_at').on(t.atMs), index('forecast_polls_url_at').on(t.url, t.atMs)],
);
