/**
 * Configurations (design §2.5 v2): a structure as registered plus named sets of changes to its
 * kind's own fields — a screen lowered (`bottomHeightM`), a tent with its sides off (`sides`), a
 * fence with its scrim removed (`solidity`), a custom record's `faces`. Each configuration is the
 * registered record with its changes applied, checked by the kind's own schema like any record,
 * and assessed by the same engine: its own limit gust, governing case and level gusts.
 *
 * A record lists them as `configurations: [{name, changes}]` (kinds/recordBase.ts, at most
 * `maxConfigurations`). A change replaces the top-level field of the same name (an object such as
 * `sides`, `coefficients` or `faces` is replaced whole, never merged); null removes an optional
 * field, so its default applies. `kind`, `name`, `configurationName` and `configurations` cannot
 * be changed. The configuration as registered is named by `configurationName`, default
 * "as registered"; every name is unique within the record, compared ignoring case.
 *
 * Issue paths are those of `validateStructureRecord` (record.ts): `configurations.<i>.name`,
 * `configurations.<i>.changes.<field>` (nested fields dotted on: `changes.sides.front`,
 * `changes.faces.0.areaM2`). A check of the kind that a change breaks on another field (a tent's
 * eave raised above its ridge, a screen raised above the record's reference height) is reported
 * at the changed field, its message naming the field whose check failed.
 */
import { assessStructure, type AssessmentOptions, type AssessmentReport } from './assess.ts';
import { defaultRegisteredConfigurationName, maxConfigurations } from './kinds/recordBase.ts';
import { kindDefinition } from './kinds/index.ts';
import { validateRecordItself, type RecordIssue, type StructureKind, type StructureRecord } from './record.ts';

export { defaultRegisteredConfigurationName, maxConfigurations };

/** One configuration as a record lists it. */
export type Configuration = NonNullable<StructureRecord['configurations']>[number];

/** Fields a configuration may not change: who the structure is, and the configurations themselves. */
export const unchangeableFields: readonly string[] = ['kind', 'name', 'configurationName', 'configurations'];

/** A configuration made concrete: its name and the whole record in it. */
export interface ConfiguredRecord {
  name: string;
  /** True for the configuration as registered (always the first in a list). */
  registered: boolean;
  /** The record in this configuration: the registered one with the changes applied, without `configurations` and `configurationName`. */
  record: StructureRecord;
}

/** The outcome of applying changes: the changed record, or every problem at paths relative to `changes` ("heightM", "sides.front"). */
export type ConfigurationResult = { ok: true; record: StructureRecord } | { ok: false; issues: RecordIssue[] };

/** A configuration's figures at the gust: the calculator's top-level figures for the record in that configuration. */
export type ConfigurationAssessment = { name: string; registered: boolean } & Pick<
  AssessmentReport,
  | 'calculatedLimitGustMps'
  | 'limitGustMps'
  | 'limitGovernedBy'
  | 'utilization'
  | 'unbounded'
  | 'governing'
  | 'governingDirectionDeg'
  | 'governingElement'
  | 'governingText'
  | 'effectiveUtilization'
  | 'margin'
  | 'warnings'
>;

/** Names are compared trimmed, ignoring case (and Unicode composition). */
function nameKey(name: string): string {
  return name.trim().normalize('NFC').toLowerCase();
}

/** True when two configuration names name the same configuration (trimmed, ignoring case and Unicode composition): the one rule for the register, the levels and the live watch. */
export function sameConfigurationName(a: string, b: string): boolean {
  return nameKey(a) === nameKey(b);
}

/** The name of the record's configuration as registered: `configurationName`, else "as registered". */
export function registeredConfigurationName(record: Pick<StructureRecord, 'configurationName'>): string {
  return record.configurationName ?? defaultRegisteredConfigurationName;
}

/** The top-level fields of a kind's record, read from its schema. */
function kindFields(kind: StructureKind): ReadonlySet<string> {
  return new Set(Object.keys(kindDefinition(kind).schema.shape));
}

/** The record itself, without its configurations: what every configuration starts from. */
function withoutConfigurations(record: StructureRecord): StructureRecord {
  const { configurations: _configurations, configurationName: _name, ...rest } = record;
  return rest as StructureRecord;
}

/**
 * Applies one configuration's changes to a valid record and checks the result with the kind's own
 * schema (and the reference-height check of every record). Issue paths are relative to `changes`:
 * the changed field ("heightM", "sides.front"); when a change breaks another field's check, the
 * changed field without which that check passes (each such field; "" when only several together
 * break it), the message naming the field whose check failed.
 *
 * @example applyConfiguration(screen, { bottomHeightM: 0.5 })   // → { ok: true, record: {...screen, bottomHeightM: 0.5} }
 * @example applyConfiguration(screen, { depthM: 2 })            // → { ok: false, issues: [{ path: 'depthM', message: 'is not a field of a screen record' }] }
 */
export function applyConfiguration(record: StructureRecord, changes: Readonly<Record<string, unknown>>): ConfigurationResult {
  const fields = kindFields(record.kind);
  const issues: RecordIssue[] = [];
  if (Object.keys(changes).length === 0) issues.push({ path: '', message: 'must change at least one field of the record' });
  const changed: string[] = [];
  for (const field of Object.keys(changes)) {
    if (unchangeableFields.includes(field)) {
      issues.push({ path: field, message: `cannot be changed by a configuration (${unchangeableFields.join(', ')} belong to the structure)` });
    } else if (!fields.has(field)) {
      issues.push({ path: field, message: `is not a field of ${kindDefinition(record.kind).recordWords} record (check the spelling)` });
    } else changed.push(field);
  }
  // The fields that may change are checked even when others may not, so one answer names everything.
  const checked = validateRecordItself(changedRecord(record, changes, changed));
  if (checked.ok) return issues.length > 0 ? { ok: false, issues } : checked;
  for (const issue of checked.issues) {
    const top = issue.path.split('.')[0]!;
    if (top !== '' && changed.includes(top)) {
      issues.push(issue);
      continue;
    }
    // Another field's check fails: blame the changes without which it passes.
    const what = issue.path === '' ? `the record ${issue.message}` : `${issue.path} ${issue.message}`;
    const culprits =
      changed.length === 1
        ? changed
        : changed.filter((field) => {
            const without = validateRecordItself(changedRecord(record, changes, changed.filter((other) => other !== field)));
            return without.ok || !without.issues.some((other) => other.path === issue.path);
          });
    if (culprits.length === 0) issues.push({ path: '', message: `break a check of the record together: ${what}` });
    for (const field of culprits) issues.push({ path: field, message: `breaks a check of the record: ${what}` });
  }
  return { ok: false, issues };
}

/**
 * The record itself with the listed fields of `changes` applied (null removes the field), and what
 * the kind carries along with them (its definition's `configured`: a screen lowered on its towers
 * leaves the towers standing, kinds/screen.ts).
 */
function changedRecord(record: StructureRecord, changes: Readonly<Record<string, unknown>>, fields: readonly string[]): Record<string, unknown> {
  const merged: Record<string, unknown> = { ...withoutConfigurations(record) };
  for (const field of fields) {
    if (changes[field] === null) delete merged[field];
    else merged[field] = changes[field];
  }
  kindDefinition(record.kind).configured?.(record, merged, fields);
  return merged;
}

/**
 * Every problem with a (parsed, otherwise valid) record's configurations, at paths from the
 * record: `configurations.<i>.name`, `configurations.<i>.changes[.<field>…]`. Empty: all valid.
 * `validateStructureRecord` runs it; it is exported for callers that hold a parsed record.
 */
export function configurationIssues(record: StructureRecord): RecordIssue[] {
  const list = record.configurations ?? [];
  const issues: RecordIssue[] = [];
  const registered = registeredConfigurationName(record);
  const seen = new Map<string, number>([[nameKey(registered), -1]]);
  list.forEach((configuration, index) => {
    const key = nameKey(configuration.name);
    const reserved = key === nameKey(defaultRegisteredConfigurationName) || key === nameKey(registered);
    const earlier = seen.get(key);
    if (reserved) {
      issues.push({ path: `configurations.${index}.name`, message: `must differ from the name of the configuration as registered (“${registered}”${registered === defaultRegisteredConfigurationName ? '' : ` or “${defaultRegisteredConfigurationName}”`})` });
    } else if (earlier !== undefined) {
      const first = earlier === -1 ? registered : list[earlier]!.name;
      issues.push({ path: `configurations.${index}.name`, message: `repeats the name of configurations.${earlier} (“${first}”): names must differ, ignoring case` });
    } else seen.set(key, index);
    const result = applyConfiguration(record, configuration.changes);
    if (!result.ok) {
      for (const issue of result.issues) {
        issues.push({ path: [`configurations.${index}.changes`, issue.path].filter((part) => part !== '').join('.'), message: issue.message });
      }
    }
  });
  return issues;
}

/**
 * Every configuration of a valid record (see `validateStructureRecord`) as a whole record: the one
 * as registered first, then the record's `configurations` in their order. A record without
 * configurations gives one entry. Throws a RangeError when a configuration is invalid (the record
 * was not validated).
 */
export function recordConfigurations(record: StructureRecord): ConfiguredRecord[] {
  const configured: ConfiguredRecord[] = [{ name: registeredConfigurationName(record), registered: true, record: withoutConfigurations(record) }];
  (record.configurations ?? []).forEach((configuration, index) => {
    const result = applyConfiguration(record, configuration.changes);
    if (!result.ok) {
      const first = result.issues[0]!;
      throw new RangeError(
        `recordConfigurations: configurations.${index} (“${configuration.name}”) is invalid: changes${first.path ? `.${first.path}` : ''} ${first.message}; validate the record first (validateStructureRecord)`,
      );
    }
    configured.push({ name: configuration.name, registered: false, record: result.record });
  });
  return configured;
}

/**
 * The configuration of a valid record with this name (trimmed, ignoring case), the one as
 * registered included; null when the record has none by that name.
 */
export function findConfiguration(record: StructureRecord, name: string): ConfiguredRecord | null {
  const key = nameKey(name);
  return recordConfigurations(record).find((configured) => nameKey(configured.name) === key) ?? null;
}

/**
 * Every configuration of a valid record assessed at the same gust and density (the calculator's
 * `configurations`): the one as registered first.
 */
export function assessConfigurations(record: StructureRecord, options: AssessmentOptions): ConfigurationAssessment[] {
  return recordConfigurations(record).map(({ name, registered, record: configured }) => {
    const report = assessStructure(configured, options);
    return {
      name,
      registered,
      calculatedLimitGustMps: report.calculatedLimitGustMps,
      limitGustMps: report.limitGustMps,
      limitGovernedBy: report.limitGovernedBy,
      utilization: report.utilization,
      unbounded: report.unbounded,
      governing: report.governing,
      governingDirectionDeg: report.governingDirectionDeg,
      governingElement: report.governingElement,
      governingText: report.governingText,
      effectiveUtilization: report.effectiveUtilization,
      margin: report.margin,
      warnings: report.warnings,
    };
  });
}
