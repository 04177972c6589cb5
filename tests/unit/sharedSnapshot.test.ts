/**
 * server/live/sharedSnapshot.ts: clients that connect within a second, with no event announced
 * in between, share one snapshot; the first of a quiet second gets its own, written as it is
 * built and not kept; a new event id or an older snapshot starts again; nothing is held a second
 * after it was built. (Our own rule, no published source: a shared snapshot is as old as a fresh
 * one is behind the once-a-second frames.)
 */
import { afterEach, describe, expect, it, vi } from 'vitest';
import { SnapshotShare, sharedSnapshotMs } from '../../server/live/sharedSnapshot.ts';

afterEach(() => {
  vi.useRealTimers();
});

function setup() {
  let lastId = 41;
  let wallMs = 1_000_000;
  let builds = 0;
  const share = new SnapshotShare(
    () => lastId,
    function* () {
      builds++;
      yield `{"build":${builds},`;
      yield '"structures":[]}';
    },
    () => wallMs,
  );
  return {
    share,
    builds: () => builds,
    announce: () => void lastId++,
    advance: (ms: number) => void (wallMs += ms),
  };
}

const text = (pieces: Iterable<string>): string => [...pieces].join('');

describe('a snapshot shared by clients that connect together', () => {
  it('gives the first client of a quiet second its own, built as it is written and not kept', () => {
    vi.useFakeTimers();
    const t = setup();
    const first = t.share.get();
    expect(first.lastId).toBe(41);
    expect(t.share.holding).toBe(false);
    expect(text(first.pieces)).toBe('{"build":1,"structures":[]}');
    expect(t.share.holding).toBe(false);
  });

  it('builds the text once for the second client within the second, and the rest share it, with the id it was built at', () => {
    vi.useFakeTimers();
    const t = setup();
    text(t.share.get().pieces);
    t.advance(400);
    const second = t.share.get();
    expect(t.share.holding).toBe(true);
    t.advance(sharedSnapshotMs - 401);
    const third = t.share.get();
    expect(t.builds()).toBe(2);
    expect(third.pieces).toBe(second.pieces);
    expect(third.lastId).toBe(41);
    expect(text(third.pieces)).toBe('{"build":2,"structures":[]}');
  });

  it('starts again once an event is announced, with the new id', () => {
    vi.useFakeTimers();
    const t = setup();
    text(t.share.get().pieces);
    t.share.get();
    t.announce();
    const after = t.share.get();
    expect(after.lastId).toBe(42);
    expect(t.share.holding).toBe(false);
    expect(text(after.pieces)).toBe('{"build":3,"structures":[]}');
  });

  it('starts again when the last one is a second old, and lets the text go a second after it was built', () => {
    vi.useFakeTimers();
    const t = setup();
    t.share.get();
    t.share.get();
    t.advance(sharedSnapshotMs);
    t.share.get();
    t.share.get();
    expect(t.share.holding).toBe(true);
    vi.advanceTimersByTime(sharedSnapshotMs);
    expect(t.share.holding).toBe(false);
  });
});
