/**
 * How a level looks: its label in words, a shape and a colour, so that colour is never the only
 * signal (sunlight, colour vision, a cracked screen). Our own code:
 * - below every level: a small filled circle, green;
 * - lower levels: a triangle, amber; middle levels: a diamond, orange;
 * - the top level: an octagon with a bar, red;
 * - no data: a dashed ring with a question mark on grey hatching — it must never pass for calm.
 * With more than three levels the in-between ones share the triangle and diamond by position.
 */
export type Tone = 'l0' | 'l1' | 'l2' | 'l3' | 'nodata';

/** The tone of `level` (0..count) in a ladder of `count` levels. */
export function levelTone(level: number | null, count: number, noData = false): Tone {
  if (noData || level === null) return 'nodata';
  if (level <= 0) return 'l0';
  if (level >= count) return 'l3';
  if (count <= 2) return 'l1';
  return level - 1 < (count - 1) / 2 ? 'l1' : 'l2';
}

export function LevelShape({ tone, size = 28 }: { tone: Tone; size?: number }) {
  const common = { width: size, height: size, viewBox: '0 0 32 32', 'aria-hidden': true as const, class: `shape shape-${tone}` };
  switch (tone) {
    case 'l0':
      return (
        <svg {...common}>
          <circle cx="16" cy="16" r="9" class="fill" />
        </svg>
      );
    case 'l1':
      return (
        <svg {...common}>
          <path d="M16 3 L30 28 H2 Z" class="fill" />
          <path d="M16 12 V20 M16 23 V25" class="mark" />
        </svg>
      );
    case 'l2':
      return (
        <svg {...common}>
          <path d="M16 1 L31 16 L16 31 L1 16 Z" class="fill" />
          <path d="M16 8 V18 M16 22 V24" class="mark" />
        </svg>
      );
    case 'l3':
      return (
        <svg {...common}>
          <path d="M10 1 H22 L31 10 V22 L22 31 H10 L1 22 V10 Z" class="fill" />
          <path d="M8 16 H24" class="mark thick" />
        </svg>
      );
    case 'nodata':
      return (
        <svg {...common}>
          <circle cx="16" cy="16" r="13" class="ring" />
          <path d="M12 12 C12 7 20 7 20 12 C20 15 16 15 16 19 M16 23 V25" class="mark q" />
        </svg>
      );
  }
}

/** The level as a badge: shape and words, e.g. ▲ "Level 1 · Watch", or "No data — wind unknown". */
export function LevelBadge(props: { level: number; label: string | null; count: number; noData?: boolean; stale?: boolean; big?: boolean }) {
  const tone = levelTone(props.level, props.count, props.noData);
  const text = props.noData ? 'No data — wind unknown' : props.level <= 0 ? 'Below all levels' : `${props.label ?? `Level ${props.level}`}`;
  return (
    <span class={`badge tone-${tone}${props.big ? ' big' : ''}${props.stale ? ' stale' : ''}`}>
      <LevelShape tone={tone} size={props.big ? 34 : 24} />
      <span class="badge-text">
        {!props.noData && props.level > 0 ? <span class="badge-num">Level {props.level} · </span> : null}
        {text}
      </span>
    </span>
  );
}
