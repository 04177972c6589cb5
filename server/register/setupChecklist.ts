/**
 * The first-start checklist: what a new site still needs before an event, each step read from
 * the register and the log as they are now (never ticked by hand): the site's settings saved,
 * a sensor and (with the embedded broker) a gateway for it, a structure, levels and actions of
 * the site's own, another person, and a reading that arrived.
 */
import type { LevelDefinition } from '../levels/levelDefinition.ts';
import { siteDefaultLevels } from '../levels/siteDefaultLevels.ts';
import type { Storage } from '../storage/storage.ts';
import { getSite } from './site.ts';

export const checklistStepIds = ['site', 'sensors', 'structures', 'levels', 'people', 'publish'] as const;
export type ChecklistStepId = (typeof checklistStepIds)[number];

export interface ChecklistStep {
  id: ChecklistStepId;
  done: boolean;
  /** The state it was read from, in one sentence. */
  detail: string;
  /** The time the step refers to (the newest reading's own timestamp), shown in the site's zone. */
  atMs: number | null;
}

export interface SetupChecklist {
  steps: ChecklistStep[];
  doneCount: number;
  /** The site's creation time: a device's dismissal is kept per site. */
  siteCreatedAtMs: number;
}

export interface ChecklistContext {
  /** Active (not disabled) people. */
  activePeople: number;
  /** 'external': gateways are the external broker's business, not ours. */
  brokerKind: 'embedded' | 'external';
  /** Refusals at the broker since start (shown when no reading has arrived yet). */
  refusedSinceStart: number;
}

const levelText = (levels: readonly LevelDefinition[]): string => JSON.stringify(levels.map((l) => [l.label, l.trigger, l.actionText.trim()]));

/** The newest stored reading of any sensor (retired ones too), by the primary key: one seek per sensor. */
async function newestReading(storage: Storage): Promise<{ sensorKey: string; sensorName: string; tsMs: number } | null> {
  let best: { sensorKey: string; sensorName: string; tsMs: number } | null = null;
  for (const s of await storage.sensors.all()) {
    // Raw readings past retention are deleted; their minute rollups stay (the store looks at both).
    const tsMs = await storage.readings.newestDataMs(s.id);
    if (tsMs !== null && (best === null || tsMs > best.tsMs)) best = { sensorKey: s.key, sensorName: s.name, tsMs };
  }
  return best;
}

export async function setupChecklist(storage: Storage, ctx: ChecklistContext): Promise<SetupChecklist> {
  const site = await getSite(storage);
  const sensors = await storage.sensors.active();
  const gatewayLinks = await storage.gateways.activeLinks();
  const structures = (await storage.structures.active()).map((s) => ({ name: s.name, levels: s.levelsJson }));

  const density = site.airDensityMode === 'fixed' ? `fixed ${site.fixedAirDensityKgM3 ?? '?'} kg/m³` : site.airDensityMode === 'isa' ? `ISA at ${site.altitudeM} m` : 'measured on site';
  const siteNow = `time zone ${site.timeZone}, terrain category ${site.terrainCategory}, air density ${density}`;
  const siteSaved = site.updatedAtMs > site.createdAtMs;

  const gatewayNames = [...new Set(gatewayLinks.map((g) => g.gateway))];
  const sensorsDone = sensors.length > 0 && (ctx.brokerKind === 'external' || gatewayNames.length > 0);
  const sensorsDetail =
    sensors.length === 0
      ? 'No sensor registered yet.'
      : ctx.brokerKind === 'external'
        ? `${sensors.length} sensor${sensors.length === 1 ? '' : 's'} registered; the external broker's own credentials let gateways publish.`
        : gatewayNames.length === 0
          ? `${sensors.length} sensor${sensors.length === 1 ? '' : 's'} registered, but no gateway may publish for ${sensors.length === 1 ? 'it' : 'them'} yet.`
          : `${sensors.length} sensor${sensors.length === 1 ? '' : 's'}; gateway${gatewayNames.length === 1 ? '' : 's'} ${gatewayNames.join(', ')}.`;

  const ownLevels = structures.filter((s) => s.levels !== null).length;
  const defaultsOwn = levelText(site.defaultLevelsJson) !== levelText(siteDefaultLevels);
  const levelsDone = defaultsOwn || ownLevels > 0;
  const levelsDetail = levelsDone
    ? [defaultsOwn ? "the site's default levels are the site's own" : null, ownLevels > 0 ? `${ownLevels} structure${ownLevels === 1 ? ' has' : 's have'} levels of ${ownLevels === 1 ? 'its' : 'their'} own` : null].filter(Boolean).join('; ').replace(/^./, (c) => c.toUpperCase()) + '.'
    : 'The levels and actions are still the wording Holdfast ships with.';

  const reading = await newestReading(storage);
  const publishDetail = reading
    ? `A reading arrived from ${reading.sensorName}.`
    : ctx.refusedSinceStart > 0
      ? `No reading yet; the broker refused ${ctx.refusedSinceStart} connection${ctx.refusedSinceStart === 1 ? '' : 's'} or message${ctx.refusedSinceStart === 1 ? '' : 's'} (see Sensors).`
      : 'No reading has arrived yet.';

  const steps: ChecklistStep[] = [
    { id: 'site', done: siteSaved, detail: siteSaved ? `Saved: ${siteNow}.` : `Not saved yet; now ${siteNow}.`, atMs: null },
    { id: 'sensors', done: sensorsDone, detail: sensorsDetail, atMs: null },
    { id: 'structures', done: structures.length > 0, detail: structures.length === 0 ? 'No structure registered yet.' : `${structures.length} registered: ${structures.slice(0, 3).map((s) => s.name).join(', ')}${structures.length > 3 ? '…' : ''}.`, atMs: null },
    { id: 'levels', done: levelsDone, detail: levelsDetail, atMs: null },
    { id: 'people', done: ctx.activePeople >= 2, detail: ctx.activePeople >= 2 ? `${ctx.activePeople} people can sign in.` : 'Only one person can sign in.', atMs: null },
    { id: 'publish', done: reading !== null, detail: publishDetail, atMs: reading?.tsMs ?? null },
  ];
  return { steps, doneCount: steps.filter((s) => s.done).length, siteCreatedAtMs: site.createdAtMs };
}
