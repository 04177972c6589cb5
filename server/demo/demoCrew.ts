/**
 * The demo's simulated crew and competent person acting on the wind action plan (design §2.5):
 * when a level alert's action moves a structure to another configuration ("Prepare: lower the
 * screen" → "lowered"), a crew member marks it done after a short while, through the watch as
 * the route POST /api/structures/:id/configuration does (the watch switches at once, the batch is
 * stored, then the stream is told); once the wind has stayed well below the structure's first
 * level in its configuration as registered, the competent person switches it back by hand with a
 * note. One action can be set to come late: acknowledged soon, marked done only after the site's
 * action time, so the tick signals it again as overdue first.
 *
 * Demo only: names are those of the invented demo site.
 */
import type { Watch } from '../watch/watch.ts';
import type { WriteBatch } from '../storage/writeBatch.ts';
import { acknowledgementBatch } from '../storage/writeBatch.ts';
import { demoAcknowledgeNotes, demoConfigurationNotes } from './demoSite.ts';
import type { Random } from './random.ts';

export interface DemoCrewOptions {
  watch: Watch;
  /** Stores a batch; the crew's changes are announced once it resolves (as the routes do). */
  store: (batch: WriteBatch) => Promise<unknown> | void;
  random: Random;
  /** The structure's kind, for the notes (one demo structure per kind). */
  kindOf: (structureId: number) => string | null;
  /** Who marks actions done (the crew) and who switches back by hand (the competent person). */
  crew: readonly string[];
  competentPerson: string;
  /** How long after the alert the crew mark an action done, ms: [shortest, longest]. */
  doneAfterMs: readonly [number, number];
  /** The site's action time, ms: the late action is marked done this long plus 2–4 min after its alert. */
  actionDueMs: number;
  /** Make the first action of this structure kind late (once); null: none late. */
  lateKind: string | null;
  /** How long the gust must stay below 90 % of the registered configuration's first trigger before the competent person switches back, ms. */
  calmForMs: number;
}

interface Planned {
  by: string;
  doneAtMs: number;
  /** For the late action: when it was acknowledged (before the action was done). */
  acknowledgeAtMs: number | null;
  acknowledged: boolean;
}

/** The audit trail's actor for what the simulated people do. */
const demoActor = 'demo crew (simulated)';

export class DemoCrew {
  private readonly planned = new Map<number, Planned>();
  private readonly calmSinceMs = new Map<number, number>();
  private lateUsed = false;
  /** Actions marked done and switches back made, for the demo's log line. */
  readonly counts = { done: 0, late: 0, back: 0 };

  constructor(private readonly options: DemoCrewOptions) {}

  /** Acts on what is due at `nowMs`. */
  step(nowMs: number): void {
    const { watch, random } = this.options;
    const open = watch.openAlerts();
    for (const alert of open) {
      if (alert.kind !== 'level' || alert.structureId === null || alert.moveToConfiguration === null || alert.actionDoneAtMs !== null) continue;
      let plan = this.planned.get(alert.id);
      if (!plan) {
        const kind = this.options.kindOf(alert.structureId);
        const late = !this.lateUsed && kind !== null && kind === this.options.lateKind;
        if (late) this.lateUsed = true;
        const [shortest, longest] = this.options.doneAfterMs;
        plan = late
          ? { by: this.pick(this.options.crew), doneAtMs: alert.raisedAtMs + this.options.actionDueMs + Math.round(120_000 + random() * 120_000), acknowledgeAtMs: alert.raisedAtMs + Math.round(45_000 + random() * 60_000), acknowledged: false }
          : { by: this.pick(this.options.crew), doneAtMs: alert.raisedAtMs + Math.round(shortest + random() * (longest - shortest)), acknowledgeAtMs: null, acknowledged: false };
        if (late) this.counts.late++;
        this.planned.set(alert.id, plan);
      }
      const kind = this.options.kindOf(alert.structureId);
      if (plan.acknowledgeAtMs !== null && !plan.acknowledged && nowMs >= plan.acknowledgeAtMs && alert.acknowledgedAtMs === null) {
        plan.acknowledged = true;
        const note = demoConfigurationNotes(kind).seenLate;
        const by = plan.by;
        // Stored first, then the watch marks it and the stream says so, as the acknowledge route does.
        void Promise.resolve(this.options.store(acknowledgementBatch({ alertId: alert.id, atMs: nowMs, by, note, actor: demoActor }))).then(() =>
          watch.acknowledged(alert.id, by, note, nowMs),
        );
      }
      if (nowMs >= plan.doneAtMs) {
        const notes = demoAcknowledgeNotes('level', kind, alert.level);
        const note = plan.acknowledgeAtMs !== null ? demoConfigurationNotes(kind).doneLate : notes[Math.floor(random() * notes.length)]!;
        const result = watch.switchConfiguration({ structureId: alert.structureId, name: alert.moveToConfiguration, by: plan.by, actor: demoActor, note, alertId: alert.id, atMs: nowMs });
        // Someone pressed Done first (a visitor on the live demo), or the alert is gone: nothing to do.
        if (!result.ok) {
          this.planned.delete(alert.id);
          continue;
        }
        this.counts.done++;
        void Promise.resolve(this.options.store(result.batch)).then(result.announce);
      }
    }
    // Forget what no longer needs doing.
    for (const id of this.planned.keys()) {
      const alert = watch.openAlert(id);
      if (!alert || alert.actionDoneAtMs !== null) this.planned.delete(id);
    }
    this.switchBack(nowMs, open);
  }

  /** The competent person puts a structure back as registered once the wind has stayed well below its first level there. */
  private switchBack(nowMs: number, open: ReturnType<Watch['openAlerts']>): void {
    const { watch } = this.options;
    for (const s of watch.snapshot().structures) {
      const registered = s.configurations[0];
      if (!registered || registered.current || s.error !== null) {
        this.calmSinceMs.delete(s.id);
        continue;
      }
      const first = registered.triggerGustsMps[0];
      const calm = s.gustMps !== null && first !== undefined && s.gustMps < 0.9 * first;
      // An action still to be done on this structure: leave it to the crew.
      const pending = open.some((a) => a.structureId === s.id && a.moveToConfiguration !== null && a.actionDoneAtMs === null);
      if (!calm || pending) {
        this.calmSinceMs.delete(s.id);
        continue;
      }
      const since = this.calmSinceMs.get(s.id) ?? nowMs;
      this.calmSinceMs.set(s.id, since);
      if (nowMs - since < this.options.calmForMs) continue;
      const result = watch.switchConfiguration({
        structureId: s.id,
        name: registered.name,
        by: this.options.competentPerson,
        actor: demoActor,
        note: demoConfigurationNotes(this.options.kindOf(s.id)).back,
        alertId: null,
        atMs: nowMs,
      });
      this.calmSinceMs.delete(s.id);
      if (!result.ok) continue;
      this.counts.back++;
      void Promise.resolve(this.options.store(result.batch)).then(result.announce);
    }
  }

  private pick(list: readonly string[]): string {
    return list[Math.floor(this.options.random() * list.length)]!;
  }
}
