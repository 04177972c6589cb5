/**
 * The register, before the event: site settings, sensors, gateways, structures, and import /
 * export of the whole register. Reading needs the viewer role; changing needs the competent
 * person. Every change reloads the live watch and is written to the audit trail.
 */
import { Hono, type Context } from 'hono';
import { siteDesignDensityKgM3, validateStructureRecord } from '../../engine/index.ts';
import { HttpError, fieldIssues, type FieldIssue } from '../httpError.ts';
import { jsonList } from '../jsonList.ts';
import { z } from 'zod';
import { principalName } from '../../auth/accounts.ts';
import { createGateway, gatewayInputSchema, gatewayUpdateSchema, getGateway, listGateways, revokeGateway, updateGateway } from '../../register/gateways.ts';
import { exportRegister, importRegister, registerCsv, registerFromCsv, registerSchema } from '../../register/registerFile.ts';
import { createSensor, getSensor, listSensors, retireSensor, sensorInputSchema, sensorUpdateSchema, updateSensor } from '../../register/sensors.ts';
import { getSite, siteUpdateSchema, updateSite } from '../../register/site.ts';
import { siteView } from '../../register/siteSettings.ts';
import { createStructure, getStructureRow, listStructures, retireStructure, structureInputSchema, structureUpdateSchema, structureView, updateStructure } from '../../register/structures.ts';
import { readingTopic } from '../../ingest/topic.ts';
import { setupChecklist } from '../../register/setupChecklist.ts';
import { requireRole, type AppEnv } from '../access.ts';
import { check, idParam, jsonBody, jsonPatchBody } from '../validate.ts';
import type { ApiContext } from './apiContext.ts';

const importSchema = z.strictObject({
  /** 'merge': add and update by sensor key and structure name; 'replace': also retire what the file does not list. */
  mode: z.enum(['merge', 'replace']).default('merge'),
  register: z.unknown(),
});

/**
 * A structure body: the fields around the record and the record itself are checked together, so
 * one answer names every problem (a bad latitude and a negative mass at once).
 */
async function structureBody<S extends z.ZodType>(c: Context, schema: S, patch = false): Promise<z.infer<S>> {
  const raw = await jsonBody(c, z.unknown());
  const issues: FieldIssue[] = [];
  const parsed = schema.safeParse(raw);
  if (!parsed.success) issues.push(...fieldIssues(parsed.error.issues));
  const record = raw !== null && typeof raw === 'object' && 'record' in raw ? (raw as { record: unknown }).record : undefined;
  if (record !== undefined) {
    const v = validateStructureRecord(record);
    if (!v.ok) issues.push(...v.issues.map((i) => ({ path: i.path ? `record.${i.path}` : 'record', message: i.message })));
  } else if (!patch) {
    issues.push({ path: 'record', message: 'is required: the structure record (kind, name, dimensions...)' });
  }
  if (issues.length > 0) throw HttpError.invalid(issues);
  const data = (parsed as { data: Record<string, unknown> }).data;
  if (!patch) return data as z.infer<S>;
  const out: Record<string, unknown> = {};
  for (const key of Object.keys(data)) if (Object.prototype.hasOwnProperty.call(raw, key)) out[key] = data[key];
  return out as z.infer<S>;
}

export function registerRoutes(ctx: ApiContext): Hono<AppEnv> {
  const api = new Hono<AppEnv>();
  const actor = (c: { get(key: 'principal'): Parameters<typeof principalName>[0] }) => principalName(c.get('principal'));
  const viewer = requireRole('viewer');
  const editor = requireRole('competent-person');

  // ---- site ----
  api.get('/site', viewer, async (c) => {
    const site = await getSite(ctx.storage);
    // The density now (the live board's) and the design density the levels are checked at on
    // save, which the register form's calculator uses too (register/levelCheck.ts).
    return c.json({ site: siteView(site), airDensityKgM3: ctx.watch.currentAirDensityKgM3, designAirDensityKgM3: siteDesignDensityKgM3(site) });
  });
  api.patch('/site', editor, async (c) => {
    const patch = await jsonPatchBody(c, siteUpdateSchema);
    const site = await updateSite(ctx.storage, patch, actor(c), ctx.now());
    await ctx.reloadRegister();
    return c.json({ site: siteView(site) });
  });

  // ---- sensors ----
  const sensorView = (s: Awaited<ReturnType<typeof getSensor>>) => ({
    ...s,
    topic: readingTopic(ctx.topicPrefix, s.key),
    live: ctx.watch.sensorStateByKey(s.key),
    rejections: ctx.rejections.list(s.key),
  });
  api.get('/sensors', viewer, async (c) => c.json({ sensors: (await listSensors(ctx.storage)).map(sensorView) }));
  api.get('/sensors/:key', viewer, async (c) => c.json({ sensor: sensorView(await getSensor(ctx.storage, c.req.param('key'))) }));
  api.post('/sensors', editor, async (c) => {
    const input = await jsonBody(c, sensorInputSchema);
    const site = await getSite(ctx.storage);
    const sensor = await createSensor(ctx.storage, site.id, input, actor(c), ctx.now());
    await ctx.registry.reload();
    return c.json({ sensor: sensorView(sensor) }, 201);
  });
  api.patch('/sensors/:key', editor, async (c) => {
    const patch = await jsonPatchBody(c, sensorUpdateSchema);
    const sensor = await updateSensor(ctx.storage, c.req.param('key'), patch, actor(c), ctx.now());
    await ctx.registry.reload();
    return c.json({ sensor: sensorView(sensor) });
  });
  api.delete('/sensors/:key', editor, async (c) => {
    await retireSensor(ctx.storage, c.req.param('key'), actor(c), ctx.now());
    await ctx.registry.reload();
    return c.json({ retired: true });
  });
  /** Rejected payloads by sensor and reason (sensor key "*" = a topic that named no sensor). */
  api.get('/rejections', viewer, (c) => c.json({ rejections: ctx.rejections.list(), total: ctx.rejections.totalCount }));
  /**
   * Refusals at the embedded broker since start (who, when, topic, reason), newest first; memory
   * only, grouped by who and why, bounded. Competent person: usernames and addresses are half of
   * a gateway's credentials.
   */
  api.get('/refusals', editor, async (c) => {
    const book = ctx.rejections.refusals;
    const broker = ((await ctx.health()).broker ?? {}) as { kind?: string };
    return c.json({ refusals: book.list(), total: book.totalCount, droppedGroups: book.droppedGroups, maxGroups: book.maxGroupCount, sinceMs: book.sinceMs, broker: broker.kind === 'embedded' ? 'embedded' : 'external' });
  });

  // ---- the first-start checklist ----
  api.get('/setup/checklist', editor, async (c) => {
    const broker = ((await ctx.health()).broker ?? {}) as { kind?: string };
    const checklist = await setupChecklist(ctx.storage, {
      activePeople: (await ctx.accounts.listPeople()).filter((p) => p.disabledAtMs === null).length,
      brokerKind: broker.kind === 'embedded' ? 'embedded' : 'external',
      refusedSinceStart: ctx.rejections.refusals.totalCount,
    });
    return c.json(checklist);
  });

  // ---- gateways (credentials: competent person only, even to read) ----
  api.get('/gateways', editor, async (c) => c.json({ gateways: await listGateways(ctx.storage) }));
  api.get('/gateways/:id', editor, async (c) => c.json({ gateway: await getGateway(ctx.storage, idParam(c)) }));
  api.post('/gateways', editor, async (c) => {
    const input = await jsonBody(c, gatewayInputSchema);
    const site = await getSite(ctx.storage);
    const { gateway, password } = await createGateway(ctx.storage, site.id, input, actor(c), ctx.now());
    await ctx.registry.reload();
    return c.json({ gateway, password, note: 'The password is shown once. Store it in the gateway now.' }, 201);
  });
  api.patch('/gateways/:id', editor, async (c) => {
    const patch = await jsonPatchBody(c, gatewayUpdateSchema);
    const { gateway, password } = await updateGateway(ctx.storage, idParam(c), patch, actor(c), ctx.now());
    await ctx.registry.reload();
    return c.json(password ? { gateway, password, note: 'The new password is shown once.' } : { gateway });
  });
  api.delete('/gateways/:id', editor, async (c) => {
    const gateway = await revokeGateway(ctx.storage, idParam(c), actor(c), ctx.now());
    await ctx.registry.reload();
    return c.json({ gateway });
  });

  // ---- structures ----
  const withLive = (view: ReturnType<typeof structureView>) => ({ ...view, live: ctx.watch.structureStateById(view.id) });
  api.get('/structures', viewer, async (c) => jsonList(c, 'structures', await listStructures(ctx.storage), withLive));
  api.get('/structures/:id', viewer, async (c) => c.json({ structure: withLive(structureView(await getStructureRow(ctx.storage, idParam(c)))) }));
  api.post('/structures', editor, async (c) => {
    const input = await structureBody(c, structureInputSchema);
    const site = await getSite(ctx.storage);
    const view = await createStructure(ctx.storage, site.id, input, actor(c), ctx.now());
    await ctx.reloadRegister();
    return c.json({ structure: withLive(view) }, 201);
  });
  api.patch('/structures/:id', editor, async (c) => {
    const id = idParam(c);
    const patch = (await structureBody(c, structureUpdateSchema, true)) as Partial<z.infer<typeof structureUpdateSchema>>;
    const view = await updateStructure(ctx.storage, id, patch, actor(c), ctx.now());
    await ctx.reloadRegister();
    return c.json({ structure: withLive(view) });
  });
  api.delete('/structures/:id', editor, async (c) => {
    await retireStructure(ctx.storage, idParam(c), actor(c), ctx.now());
    await ctx.reloadRegister();
    return c.json({ retired: true });
  });

  // ---- the whole register ----
  api.get('/register', viewer, async (c) => {
    const file = await exportRegister(ctx.storage, ctx.now());
    c.header('Content-Disposition', 'attachment; filename="register.json"');
    return c.json(file);
  });
  api.get('/register.csv', viewer, async (c) => {
    const file = await exportRegister(ctx.storage, ctx.now());
    c.header('Content-Type', 'text/csv; charset=utf-8');
    c.header('Content-Disposition', 'attachment; filename="register.csv"');
    return c.body(registerCsv(file));
  });
  api.post('/register/import', editor, async (c) => {
    const type = (c.req.header('content-type') ?? '').toLowerCase();
    let mode: 'merge' | 'replace';
    let register: z.infer<typeof registerSchema>;
    if (type.includes('text/csv')) {
      mode = c.req.query('mode') === 'replace' ? 'replace' : 'merge';
      register = registerFromCsv(await c.req.text());
    } else {
      const body = await jsonBody(c, importSchema);
      mode = body.mode;
      register = check(registerSchema, body.register, 'register');
    }
    const summary = await importRegister(ctx.storage, register, mode, actor(c), ctx.now());
    // The registry's reload reloads the watch too (runtime.ts); the site block may have changed the forecast feed.
    await ctx.registry.reload();
    await ctx.forecastFeed?.settingsChanged();
    return c.json({ imported: summary });
  });

  return api;
}
