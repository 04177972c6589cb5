/**
 * A structure's configurations in one line on its card (design §2.5): the current one first and
 * marked "now", with its limit, then the limit in each of the others ("Raised · limit 14.2 m/s ·
 * lowered 23.8 m/s"), and who switched it when. A current configuration the server does not tell
 * is said to be unknown, never taken for the one as registered.
 */
import { configurationLine, configurationsNow } from '../configurationState.ts';
import type { StructureState } from '../types.ts';
import { hourMinute, type SpeedUnit } from '../units.ts';

export function ConfigurationLineView({ s, unit, timeZone }: { s: StructureState; unit: SpeedUnit; timeZone: string }) {
  const line = configurationLine(s, unit);
  const now = configurationsNow(s);
  if (!line || !now) return null;
  return (
    <p class={`cfg-line${line.currentKnown ? '' : ' is-unknown'}`} data-testid="cfg-line" aria-label={`Configuration: ${line.text}`}>
      {line.currentKnown ? null : (
        <strong class="cfg-unknown">
          ⚠ Configuration unknown<span class="cfg-sep"> · </span>
        </strong>
      )}
      {line.parts.map((p, i) => (
        <span key={p.name} class={p.current ? 'cfg-part is-current' : 'cfg-part'}>
          {i > 0 ? <span class="cfg-sep"> · </span> : null}
          {p.current ? <span class="cfg-now">now</span> : null}
          <span class="cfg-name">{p.name}</span>
          {p.current ? <span class="cfg-sep"> · </span> : ' '}
          <span class="cfg-limit nowrap">{p.limitText}</span>
        </span>
      ))}
      {line.currentKnown && now.sinceMs !== null ? (
        <span class="cfg-since">
          {' '}
          (since {hourMinute(now.sinceMs, timeZone)}
          {now.by ? `, ${now.by}` : ''})
        </span>
      ) : null}
    </p>
  );
}
