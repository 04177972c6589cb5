/**
 * Simulated gusty wind for the demo anemometers and the benchmarks. Seeded, so a run repeats.
 *
 * The model, in plain terms:
 * - A mean wind at 10 m that changes over hours (a slow daily swing) plus scripted windy spells
 *   in which it ramps up, holds and dies down.
 * - Turbulence: Ornstein–Uhlenbeck processes (first-order autoregressive, the usual simple model
 *   of atmospheric turbulence) with an integral time scale of about 15 s and a turbulence
 *   intensity of 0.18, close to EN 1991-1-4's I_v at 10 m over open country (0.189, category II).
 *   A site-wide component is shared by every sensor (correlation about 0.7) and each sensor adds
 *   its own; short gust bursts of 3–8 s are added now and then. The 3-s / 10-min gust factor
 *   this gives is about 1.4–1.6, in the range reported for open terrain (ESDU 1.45; Harper,
 *   Kepert & Ginger 2010 in-land 1.66).
 * - Direction: a mean that veers slowly plus its own wander (about ±15°).
 * - Height: a sensor at z sees the 10-m mean scaled by the log law over z0 = 0.05 m.
 * These choices make realistic-looking data; they are not a site's climate.
 */
import { normal, seededRandom, type Random } from './random.ts';

export interface WindSpell {
  /** When the spell starts to build, ms since the simulation's start. */
  startMs: number;
  rampMs: number;
  holdMs: number;
  /** The 10-minute mean at 10 m at the top of the spell, m/s. */
  peakMeanMps: number;
}

export interface SimulatedSensor {
  key: string;
  heightM: number;
  /** How strongly this sensor's own turbulence departs from the site's (0..1). */
  ownShare?: number;
}

export interface WindSimulatorOptions {
  seed: number;
  startMs: number;
  /** Mean at 10 m outside spells, m/s. */
  baseMeanMps: number;
  /** Amplitude of the slow daily swing of the mean, m/s. */
  dailySwingMps: number;
  spells: WindSpell[];
  sensors: SimulatedSensor[];
  /** Mean direction the wind blows from at the start, degrees. */
  baseDirDeg: number;
}

export interface SimulatedSample {
  key: string;
  tsMs: number;
  speedMps: number;
  dirDeg: number;
  tempC: number;
  pressureHpa: number;
  rhPct: number;
}

const integralTimeScaleS = 15;
const turbulenceIntensity = 0.18;
const z0M = 0.05;

interface SensorState {
  spec: SimulatedSensor;
  own: number;
  dirOwn: number;
  burstLeftS: number;
  burstGain: number;
}

export class WindSimulator {
  private readonly random: Random;
  private shared = 0;
  private dirShared = 0;
  private lastMs: number;
  private readonly states: SensorState[];

  constructor(private readonly options: WindSimulatorOptions) {
    this.random = seededRandom(options.seed);
    this.lastMs = options.startMs;
    this.states = options.sensors.map((spec) => ({ spec, own: 0, dirOwn: 0, burstLeftS: 0, burstGain: 0 }));
  }

  /** The scripted 10-minute mean at 10 m at time `tsMs`. */
  meanAt10mMps(tsMs: number): number {
    const o = this.options;
    const t = tsMs - o.startMs;
    const hourOfDay = ((tsMs / 3_600_000) % 24 + 24) % 24;
    // Afternoon wind is stronger over land (daytime mixing): peak at 15:00, lowest at 03:00.
    let mean = o.baseMeanMps + o.dailySwingMps * Math.cos(((hourOfDay - 15) / 24) * 2 * Math.PI);
    for (const spell of o.spells) {
      const s = t - spell.startMs;
      if (s < 0 || s > 2 * spell.rampMs + spell.holdMs) continue;
      const up = Math.min(1, s / spell.rampMs);
      const down = Math.min(1, Math.max(0, (2 * spell.rampMs + spell.holdMs - s) / spell.rampMs));
      const shape = Math.min(up, down);
      // Smooth step so the mean does not kink.
      const smooth = shape * shape * (3 - 2 * shape);
      mean = Math.max(mean, mean + (spell.peakMeanMps - mean) * smooth);
    }
    return Math.max(0.5, mean);
  }

  /** Advances the simulation to `tsMs` and returns one sample per sensor. */
  sample(tsMs: number): SimulatedSample[] {
    const dtS = Math.max(0.05, Math.min(60, (tsMs - this.lastMs) / 1000));
    this.lastMs = tsMs;
    const decay = Math.exp(-dtS / integralTimeScaleS);
    const kick = Math.sqrt(1 - decay * decay);
    this.shared = this.shared * decay + kick * normal(this.random);
    this.dirShared = this.dirShared * Math.exp(-dtS / 120) + Math.sqrt(1 - Math.exp((-2 * dtS) / 120)) * normal(this.random);
    const mean10 = this.meanAt10mMps(tsMs);
    const hours = (tsMs - this.options.startMs) / 3_600_000;
    const meanDir = this.options.baseDirDeg + 25 * Math.sin(hours / 5) + 12 * this.dirShared;
    const out: SimulatedSample[] = [];
    for (const s of this.states) {
      s.own = s.own * decay + kick * normal(this.random);
      s.dirOwn = s.dirOwn * Math.exp(-dtS / 20) + Math.sqrt(1 - Math.exp((-2 * dtS) / 20)) * normal(this.random);
      const ownShare = s.spec.ownShare ?? 0.5;
      const fluctuation = Math.sqrt(1 - ownShare * ownShare) * this.shared + ownShare * s.own;
      // Gust bursts: on average one every ~2 minutes, lasting 3–8 s.
      if (s.burstLeftS <= 0 && this.random() < dtS / 120) {
        s.burstLeftS = 3 + 5 * this.random();
        s.burstGain = 0.1 + 0.2 * this.random();
      }
      const burst = s.burstLeftS > 0 ? s.burstGain : 0;
      s.burstLeftS -= dtS;
      const heightScale = Math.log(s.spec.heightM / z0M) / Math.log(10 / z0M);
      const meanHere = mean10 * heightScale;
      const speed = Math.max(0, meanHere * (1 + turbulenceIntensity * fluctuation + burst));
      const dir = (((meanDir + 15 * s.dirOwn) % 360) + 360) % 360;
      out.push({
        key: s.spec.key,
        tsMs,
        speedMps: Math.round(speed * 100) / 100,
        dirDeg: Math.round(dir),
        tempC: Math.round((14 + 5 * Math.cos(((((tsMs / 3_600_000) % 24) - 15) / 24) * 2 * Math.PI)) * 10) / 10,
        pressureHpa: Math.round((1008 - 4 * Math.min(1, mean10 / 15)) * 10) / 10,
        rhPct: 70,
      });
    }
    return out;
  }
}
