/**
 * What the board says of a structure's foresight (web/src/foresightWords.ts; design §2.7, issue 17).
 *
 * Checked against:
 * - a hand-worked example of Rice's up-crossing count and Davenport's peak factor (S. O. Rice,
 *   "Mathematical analysis of random noise", Bell System Technical Journal 23-24, 1944-45;
 *   A. G. Davenport, Proc. ICE 28, 1964; the formulas from memory, as in design §2.7), worked in
 *   the comment below and fed through the server's own figures (server/watch/structureForesight.ts)
 *   so the words are checked on what the board really receives;
 * - the knot's definition (1 kn = 1 852 m per hour, international nautical mile) for the unit;
 * - the display rules the issue states: "< 1 %" below 0.5 %, "> 99 %" above 99.5 %, whole percent
 *   between; unknown is "no estimate yet (why)", never 0 %;
 * - every reason the server's foresight can give (foresight/windowStatistics.ts,
 *   summaryStatistics.ts, meanTrend.ts, timeToLevel.ts), produced by those functions themselves on
 *   invented series, must come out in plain words, not as a code.
 * Sites, sensors and structures are invented.
 */
import { describe, expect, it } from 'vitest';
import { meanTrend, summaryStatistics, windowStatistics, type KnownWindStatistics, type MeanSeries, type WindStatistics } from '../../../server/foresight/index.ts';
import type { TrendStatus } from '../../../server/foresight/meanTrend.ts';
import type { UnknownReason } from '../../../server/foresight/windowStatistics.ts';
import { foresightCell, foresightFromCell, structureForesight, type ForesightInput, type ForesightView } from '../../../server/watch/structureForesight.ts';
import {
  aboutMinutes,
  chanceText,
  foresightInputs,
  foresightLineParts,
  foresightLineText,
  noEstimateText,
  readForesight,
  trendText,
  unknownWhy,
} from '../../../web/src/foresightWords.ts';

const nb = '\u00a0';
const t0 = Date.UTC(2026, 5, 13, 14, 0, 0);
const names = (key: string) => ({ 'mast-a': 'Mast A', 'mast-b': 'Gate mast' })[key] ?? key;
const levels = [{ label: 'Watch' }, { label: 'Prepare' }, { label: 'Stop and clear' }];

/** The 10-minute means of the last hour, one a minute, rising 0.1 m/s a minute to `endMps` at t0. */
function risingMeans(endMps: number, perMinute = 0.1): MeanSeries {
  const atMs: number[] = [];
  const meanMps: number[] = [];
  for (let i = 60; i >= 0; i--) {
    atMs.push(t0 - i * 60_000);
    meanMps.push(endMps - i * perMinute);
  }
  return { atMs, meanMps };
}

const known = (meanMps: number, sigmaMps: number, upcrossingRateHz: number): KnownWindStatistics => ({
  status: 'known',
  source: 'samples',
  meanMps,
  sigmaMps,
  upcrossingRateHz,
  upcrossingRateSource: 'counted',
  peakMps: meanMps + 3 * sigmaMps,
  sampleCount: 600,
  observedS: 599,
  upcrossings: Math.round(upcrossingRateHz * 599),
});

function foresight(over: Partial<ForesightInput> = {}) {
  return structureForesight({
    sensorKey: 'mast-a',
    statistics: known(12, 2, 0.2),
    heightFactor: 1,
    means: risingMeans(12),
    gustFactor: 1.5,
    level: 2,
    levels,
    triggerGustsMps: [14, 17, 20],
    limitGustMps: 22,
    nowMs: t0,
    ...over,
  });
}

const subject = (f: ReturnType<typeof foresight> | null, over: { noData?: boolean; error?: string | null } = {}) => ({ foresight: f, noData: over.noData ?? false, error: over.error ?? null });

describe('chances in words', () => {
  it('says "< 1 %" below 0.5 %, whole percent between, "> 99 %" from 99.5 %', () => {
    expect(chanceText(0)).toBe(`<${nb}1${nb}%`);
    expect(chanceText(0.0049)).toBe(`<${nb}1${nb}%`);
    expect(chanceText(0.005)).toBe(`1${nb}%`);
    expect(chanceText(0.0149)).toBe(`1${nb}%`);
    expect(chanceText(0.12)).toBe(`12${nb}%`);
    expect(chanceText(0.994)).toBe(`99${nb}%`);
    // 99.5 % would round to "100 %": an estimate never says certain.
    expect(chanceText(0.995)).toBe(`>${nb}99${nb}%`);
    expect(chanceText(1)).toBe(`>${nb}99${nb}%`);
  });

  it('never says 0 % or 100 %, and a chance that is not one is unknown', () => {
    for (let i = 0; i <= 10_000; i++) {
      const text = chanceText(i / 10_000);
      expect(text).not.toMatch(/^0\D/);
      expect(text).not.toMatch(/^100\D/);
    }
    for (const bad of [null, undefined, Number.NaN, Infinity, -0.01, 1.01]) expect(chanceText(bad)).toBe('unknown');
  });

  it('rounds the time to whole minutes, at least one', () => {
    expect(aboutMinutes(800)).toBe(`about 13${nb}min`);
    expect(aboutMinutes(20)).toBe(`about 1${nb}min`);
    expect(aboutMinutes(1_500)).toBe(`about 25${nb}min`);
  });
});

describe('the card line from the server’s figures', () => {
  // Hand-worked (Rice): at the structure U = 12 m/s, σ = 2 m/s, ν = 0.2 per second (height factor 1).
  // Stop and clear at x = 20 m/s: (x − U)²/(2σ²) = 64/8 = 8, e^−8 = 3.3546e-4;
  //   30 min: N = 0.2·1800·3.3546e-4 = 0.12077, P = 1 − e^−0.12077 = 0.1138 → "11 %";
  //   10 min: N = 0.04026, P = 0.0395 → "4 %".
  // The limit at 22 m/s: 100/8 = 12.5, e^−12.5 = 3.727e-6; 30 min N = 1.342e-3, P = 0.13 % → "< 1 %".
  // Expected peak in 10 min (Davenport): νT = 120, √(2 ln 120) = 3.0944, g = 3.0944 + 0.5772/3.0944 = 3.2809,
  //   peak = 12 + 3.2809·2 = 18.56 m/s → "18.6 m/s"; in knots 18.56/0.514444 = 36.08 → "36 kn".
  // Time (the rule of foresight/timeToLevel.ts): the mean rises 0.1 m/s a minute, gust factor 1.5:
  //   t = (20/1.5 − 12)/(0.1/60) = 800 s → "about 13 min".
  const f = foresight();

  it('reads "Stop and clear: 11 % within 30 min · limit: < 1 % within 30 min · expected peak in 10 min 18.6 m/s", with the time at this trend', () => {
    expect(foresightLineText(subject(f), 'm/s')).toBe(
      `Estimate: Stop and clear: 11${nb}% within 30${nb}min · limit: <${nb}1${nb}% within 30${nb}min · expected peak in 10${nb}min 18.6${nb}m/s · Stop and clear in about 13${nb}min at this trend`,
    );
  });

  it('gives the peak in the unit chosen on the device', () => {
    expect(foresightLineParts(readView(f), 'kn')).toContain(`expected peak in 10${nb}min 36${nb}knots`);
  });

  it('says the same after the stream’s compact foresight frame (rounded cell) as from the snapshot', () => {
    // The cell carries no label: the structure's own levels name the next one.
    const fromFrame = foresightFromCell(foresightCell(f));
    const structureLevels = levels.map((l, i) => ({ level: i + 1, label: l.label }));
    expect(foresightLineText({ ...subject(fromFrame), levels: structureLevels }, 'm/s')).toBe(foresightLineText(subject(f), 'm/s'));
    // Without them it still names the level by its number, never by nothing.
    expect(foresightLineText(subject(fromFrame), 'm/s')).toContain('Level 3: 11');
  });

  it('says the next level and the limit once when the next level is triggered at the limit', () => {
    const atLimit = foresight({ triggerGustsMps: [14, 17, 22] });
    const parts = foresightLineParts(readView(atLimit), 'm/s');
    expect(parts[0]).toBe(`Stop and clear (the limit): <${nb}1${nb}% within 30${nb}min`);
    expect(parts.some((p) => p.startsWith('limit:'))).toBe(false);
  });

  it('at the top level gives the limit only, and no time to a next level', () => {
    const top = foresight({ level: 3 });
    const parts = foresightLineParts(readView(top), 'm/s');
    expect(parts[0]).toBe(`limit: <${nb}1${nb}% within 30${nb}min`);
    expect(parts.join(' ')).not.toMatch(/trend/);
    expect(trendText(readView(top), 'm/s')).toBe('already at the top level');
  });

  it('shows the inputs behind each figure: U, σ, ν and where ν came from, the height factor, the sensor and the formulas', () => {
    const rows = foresightInputs(readView(foresight({ heightFactor: 1.1, triggerGustsMps: [14, 17, 22], limitGustMps: 24 })), 'm/s', names);
    const text = Object.fromEntries(rows.map((r) => [r.key, `${r.label}: ${r.lines.join(' / ')} (${r.rule})`]));
    expect(text.wind).toContain('Mast A (mast-a)');
    expect(text.wind).toContain(`mean U 12.0${nb}m/s`);
    expect(text.wind).toContain(`spread σ 2.0${nb}m/s`);
    // ν = 0.2 per second: one up-crossing of the mean every 5 s.
    expect(text.rate).toContain('0.200 per second');
    expect(text.rate).toContain(`counted from the readings: the wind rose through its mean about once every 5${nb}s`);
    // U and σ at the structure are f times the sensor's: 13.2 and 2.2 m/s.
    expect(text.height).toContain('×1.10');
    expect(text.height).toContain(`here U 13.2${nb}m/s, σ 2.2${nb}m/s`);
    expect(text.chance).toContain('(Rice)');
    expect(text.chance).toContain('N = ν·T·exp(−(x − U)²/(2σ²))');
    expect(text.peak).toContain('Davenport');
    // g at νT = 120 is 3.28 (hand-worked above), whatever the height factor.
    expect(text.peak).toContain('g = 3.28');
    expect(text.peak).toContain('νT = 120');
    expect(text.trend).toContain('Theil–Sen');
  });

  it('says where ν came from for a sensor that sends summaries: the stated default', () => {
    const stats = summaryStatistics({ meanMps: 10, gustMps: 15 });
    const rows = foresightInputs(readView(foresight({ statistics: stats as KnownWindStatistics })), 'm/s', names);
    const rate = rows.find((r) => r.key === 'rate')!;
    const rateText = `${rate.lines.join(' ')}: ${rate.rule}`;
    expect(rateText).toContain('0.100 per second');
    expect(rateText).toContain('stated default for a sensor that sends summaries');
    expect(rows.find((r) => r.key === 'wind')!.rule).toContain("through Davenport's peak factor");
  });
});

function readView(f: ReturnType<typeof foresight> | null): ForesightView {
  const r = readForesight(subject(f));
  if (!r.known) throw new Error(`expected known figures, got ${r.reason}`);
  return r.view;
}

describe('no estimate: said, with why, never as a chance', () => {
  /** One reading a second for `seconds`, speeds from `speedAt(i)`, ending at t0. */
  const series = (seconds: number, speedAt: (i: number) => number) => {
    const atMs: number[] = [];
    const speedMps: number[] = [];
    for (let i = 0; i < seconds; i++) {
      atMs.push(t0 - (seconds - 1 - i) * 1000);
      speedMps.push(speedAt(i));
    }
    return { atMs, speedMps };
  };
  // Every reason the statistics can give, produced by the server's functions on invented series.
  const cases: Record<UnknownReason, WindStatistics> = {
    'too-few-samples': windowStatistics(series(60, (i) => 8 + Math.sin(i)), t0),
    'no-fluctuation': windowStatistics(series(600, () => 8), t0),
    'too-few-crossings': windowStatistics(series(600, (i) => 4 + i / 100), t0),
    'gust-not-above-mean': summaryStatistics({ meanMps: 9, gustMps: 9 }),
  };
  const expected: Record<UnknownReason, string> = {
    'too-few-samples': `no estimate yet (not enough readings at Mast A yet: it needs at least 100 over 5${nb}min)`,
    'no-fluctuation': 'no estimate yet (the wind at Mast A does not vary: a calm, or a stuck or iced sensor)',
    'too-few-crossings': `no estimate yet (the wind at Mast A swung about its mean fewer than 5 times in 10${nb}min: too few to tell how often gusts come)`,
    'gust-not-above-mean': 'no estimate yet (Mast A sends a gust no higher than its mean: nothing to tell the gustiness from)',
  };

  for (const reason of Object.keys(cases) as UnknownReason[]) {
    it(`${reason}: in plain words`, () => {
      const stats = cases[reason];
      expect(stats.status === 'unknown' && stats.reason).toBe(reason);
      const f = foresight({ statistics: stats });
      expect('unknown' in f!).toBe(true);
      const line = foresightLineText(subject(f), 'm/s', names);
      expect(line).toBe(`Estimate: ${expected[reason]}`);
      expect(line).not.toMatch(/\d\s?%/);
    });
  }

  it('before any figures, without data and when the structure cannot be assessed', () => {
    expect(foresightLineText(subject(null), 'm/s')).toBe('Estimate: no estimate yet (no wind figures for this structure yet)');
    // Without data the server sends null; the line says so even if old figures were kept.
    expect(foresightLineText(subject(foresight(), { noData: true }), 'm/s')).toBe('Estimate: no estimate (no live wind reaches this structure)');
    expect(foresightLineText(subject(foresight(), { error: 'bad record' }), 'm/s')).toBe('Estimate: no estimate (this structure cannot be assessed)');
    expect(noEstimateText('no height factor')).toBe('no estimate yet (the height factor from the sensor to this structure is unknown)');
  });

  it('a figure that is not a number makes the whole estimate unknown, never half shown', () => {
    const cell = foresightCell(foresight())!;
    for (const i of [2, 3, 5, 6, 7, 11, 12, 13, 14]) {
      const broken = [...cell];
      broken[i] = null;
      const r = readForesight(subject(foresightFromCell(broken)));
      expect(r.known, `cell ${i}`).toBe(false);
      expect(foresightLineText(subject(foresightFromCell(broken)), 'm/s')).toBe('Estimate: no estimate yet (the figures from the server could not be read)');
    }
  });

  it('an unknown answer it has no words for is passed on, with the sensor named', () => {
    expect(unknownWhy('mast-b: something-new', names)).toBe('Gate mast: something-new');
  });
});

describe('why there is no time to the next level, in plain words', () => {
  const minute = 60_000;
  /** 61 means a minute apart ending at t0, from `meanAt(i)`. */
  const means = (meanAt: (i: number) => number, points = 61): MeanSeries => ({
    atMs: Array.from({ length: points }, (_, i) => t0 - (points - 1 - i) * minute),
    meanMps: Array.from({ length: points }, (_, i) => meanAt(i)),
  });
  // Each status from the server's own trend rule (foresight/meanTrend.ts) on an invented series.
  const series: Record<Exclude<TrendStatus, 'rising'>, MeanSeries> = {
    'too-few-points': means((i) => 8 + i * 0.1, 20),
    flat: means(() => 8),
    falling: means((i) => 14 - i * 0.1),
    'too-noisy': means((i) => 8 + i * 0.01 + (i % 2 === 0 ? 1.5 : -1.5)),
  };
  const words: Record<Exclude<TrendStatus, 'rising'>, string> = {
    'too-few-points': 'not enough history yet (needs 30 min)',
    flat: `the mean wind is steady (changing by less than 0.5${nb}m/s an hour): no time to give`,
    falling: 'the mean wind is falling: no time to give',
    'too-noisy': 'the mean wind goes up and down too much to call a trend',
  };
  for (const status of Object.keys(series) as Array<Exclude<TrendStatus, 'rising'>>) {
    it(status, () => {
      expect(meanTrend(series[status], t0).status).toBe(status);
      const f = foresight({ statistics: known(8, 1.5, 0.2), means: series[status] });
      const v = readView(f);
      expect(v.trend).toBe(status);
      expect(trendText(v, 'm/s')).toBe(words[status]);
      expect(foresightInputs(v, 'm/s').find((r) => r.key === 'trend')!.lines).toEqual([words[status]]);
      // No time on the line when there is none.
      expect(foresightLineParts(v, 'm/s').join(' ')).not.toMatch(/at this trend/);
    });
  }

  it('beyond-horizon: a rise too slow to reach the level within the hour it was measured over', () => {
    const v = readView(foresight({ statistics: known(8, 1.5, 0.2), means: risingMeans(8, 0.02) }));
    expect(v.trend).toBe('beyond-horizon');
    expect(trendText(v, 'm/s')).toBe('not within the time the trend was measured over (up to an hour): no time given that far ahead');
  });

  it('reached: the usual peak at this gust factor is at the next level already', () => {
    // 1.5 × 14 = 21 m/s ≥ the next trigger, 20 m/s.
    const v = readView(foresight({ statistics: known(14, 2, 0.2) }));
    expect(v.trend).toBe('reached');
    expect(foresightLineParts(v, 'm/s').at(-1)).toBe('Stop and clear may come at any time');
  });

  it('the steady-wind threshold in the chosen unit', () => {
    // 0.5 m/s = 1.8 km/h, shown to whole km/h.
    expect(trendText({ trend: 'flat', nextLevelInS: null }, 'km/h')).toContain(`less than 2${nb}km/h an hour`);
  });

  it('no gust factor', () => {
    const v = readView(foresight({ gustFactor: null }));
    expect(trendText(v, 'm/s')).toBe('the gust factor at the sensor is unknown: no time to give');
  });
});
