/**
 * A sensor's 3-second running mean speed, once a second over the last 10 minutes, from its
 * one-second buckets (sensorWindState.ts): the series the foresight figures take (design §2.7).
 * The value at second s is the span-weighted mean of the buckets s−2, s−1 and s (WMO-No. 8
 * §5.8.2: the gust is the 3-s running mean); a second without all three buckets written gives no
 * value (a gap; foresight/windowStatistics.ts counts no crossing across it).
 *
 * Raw samples only: a summary sensor's buckets hold its means as sent, whose spread is not that of
 * a 3-s mean — for those the caller uses the gust factor (foresight summaryStatistics).
 *
 * Pure; allocates its two output arrays once per call (600 entries).
 */
import { bucketCount, meanWindowMs, type SensorWindState } from './sensorWindState.ts';

export interface ThreeSecondMeans {
  atMs: Float64Array;
  speedMps: Float64Array;
}

const secondsInWindow = meanWindowMs / 1000;

export function threeSecondMeans(state: SensorWindState, nowMs: number): ThreeSecondMeans {
  const atMs = new Float64Array(secondsInWindow);
  const speedMps = new Float64Array(secondsInWindow);
  let n = 0;
  const newestSecond = Math.floor(nowMs / 1000);
  for (let second = newestSecond - secondsInWindow + 1; second <= newestSecond; second++) {
    let span = 0;
    let speedSpan = 0;
    let complete = true;
    for (let k = 0; k < 3; k++) {
      const s = second - k;
      const i = ((s % bucketCount) + bucketCount) % bucketCount;
      if (state.bucketSecond[i] !== s || state.bucketSpanMs[i]! <= 0) {
        complete = false;
        break;
      }
      span += state.bucketSpanMs[i]!;
      speedSpan += state.bucketSpeedSpan[i]!;
    }
    if (!complete) continue;
    atMs[n] = second * 1000 + 999;
    speedMps[n] = speedSpan / span;
    n++;
  }
  return { atMs: atMs.subarray(0, n), speedMps: speedMps.subarray(0, n) };
}
