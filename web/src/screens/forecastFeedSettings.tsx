/**
 * Site settings, "Forecast feed" (issue 17): the address the server polls a forecast from, how
 * often, the unit of bare numbers and the height of its speeds. Saved on its own (PATCH
 * /api/site with these four fields) and answered with the state of the feed after a poll now.
 * Other roles read the settings as text.
 */
import { useEffect, useState } from 'preact/hooks';
import { api, ApiError, errorText } from '../api.ts';
import { Field } from '../components/field.tsx';
import { plainMessage, typedNumber } from '../register/structureDraft.ts';
import { loadSite } from '../site.ts';
import type { SiteView } from '../types.ts';
import { speedUnits } from '../units.ts';

type FeedUnit = NonNullable<SiteView['forecastFeedUnit']>;

const minutes = (ms: number | undefined): string => (ms === undefined ? '30' : String(Math.round((ms / 60_000) * 10) / 10));

export function ForecastFeedSettings({ s, canEdit }: { s: SiteView; canEdit: boolean }) {
  const [url, setUrl] = useState(s.forecastFeedUrl ?? '');
  const [intervalMin, setIntervalMin] = useState(minutes(s.forecastFeedIntervalMs));
  const [unit, setUnit] = useState<FeedUnit | ''>(s.forecastFeedUnit ?? '');
  const [height, setHeight] = useState(String(s.forecastFeedHeightM ?? 10));
  const [issues, setIssues] = useState<Map<string, string>>(new Map());
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const [busy, setBusy] = useState(false);

  useEffect(() => {
    setUrl(s.forecastFeedUrl ?? '');
    setIntervalMin(minutes(s.forecastFeedIntervalMs));
    setUnit(s.forecastFeedUnit ?? '');
    setHeight(String(s.forecastFeedHeightM ?? 10));
  }, [s.updatedAtMs]);

  if (!canEdit) {
    return (
      <section aria-labelledby="ff-ro-h">
        <h2 id="ff-ro-h">Forecast feed</h2>
        <p>
          {s.forecastFeedUrl
            ? `Polled every ${minutes(s.forecastFeedIntervalMs)} min; speeds at ${s.forecastFeedHeightM ?? 10} m${s.forecastFeedUnit ? `, bare numbers in ${s.forecastFeedUnit}` : ''}. The Plan screen shows what it says and whether it is up to date.`
            : 'No forecast feed is set.'}
        </p>
      </section>
    );
  }

  const e = (k: string) => (issues.get(k) ? plainMessage(issues.get(k)!) : undefined);
  const save = async () => {
    setBusy(true);
    setMessage(null);
    setIssues(new Map());
    const local = new Map<string, string>();
    const every = typedNumber(intervalMin);
    const h = typedNumber(height);
    if (every === undefined || Number.isNaN(every)) local.set('forecastFeedIntervalMs', 'must be a number of minutes');
    if (h === undefined || Number.isNaN(h)) local.set('forecastFeedHeightM', 'must be a number of metres');
    if (local.size > 0) {
      setIssues(local);
      setMessage({ ok: false, text: 'Not saved: some fields need attention.' });
      setBusy(false);
      return;
    }
    try {
      await api('/api/site', {
        method: 'PATCH',
        body: { forecastFeedUrl: url.trim() === '' ? null : url.trim(), forecastFeedIntervalMs: Math.round(every! * 60_000), forecastFeedUnit: unit === '' ? null : unit, forecastFeedHeightM: h },
      });
      await loadSite();
      if (url.trim() === '') setMessage({ ok: true, text: 'Saved: no forecast feed is polled.' });
      else {
        const { poll } = await api<{ poll: { ok: boolean; error: string | null; rowCount: number } }>('/api/forecast/feed/poll', { method: 'POST', body: {} });
        setMessage(poll.ok ? { ok: true, text: `Saved. The feed was read just now: ${poll.rowCount} forecast rows.` } : { ok: false, text: `Saved, but the feed could not be read just now: ${poll.error ?? 'no reason given'}.` });
      }
    } catch (err) {
      if (err instanceof ApiError && err.issues.length > 0) setIssues(new Map(err.issues.map((i) => [i.path, i.message])));
      setMessage({ ok: false, text: `Not saved: ${errorText(err)}` });
    } finally {
      setBusy(false);
    }
  };

  return (
    <section aria-labelledby="ff-h">
      <h2 id="ff-h">Forecast feed</h2>
      <p class="help">The server reads a forecast from this address (a CSV table as the Plan screen accepts, or JSON) and shows each structure’s predicted level for the next 12 hours on the Plan screen. A feed that fails or is late is shown as such.</p>
      <Field id="ff-url" label="Address" error={e('forecastFeedUrl')} help="http:// or https://; empty for no feed. Everyone signed in can read this address (site settings, register export, audit trail): put no secret in it you would not share with them." wide>
        <input id="ff-url" type="url" inputMode="url" value={url} maxLength={2000} placeholder="https://forecast.example/site.csv" onInput={(ev) => setUrl(ev.currentTarget.value)} />
      </Field>
      <div class="grid2">
        <Field id="ff-every" label="Poll every" unit="min" error={e('forecastFeedIntervalMs')} help="5 to 360 min (default 30). Stale after twice this without a good poll.">
          <input id="ff-every" inputMode="decimal" value={intervalMin} onInput={(ev) => setIntervalMin(ev.currentTarget.value)} />
        </Field>
        <Field id="ff-unit" label="Unit of bare numbers" error={e('forecastFeedUnit')} help="When the file’s header or cells do not say.">
          <select id="ff-unit" value={unit} onChange={(ev) => setUnit(ev.currentTarget.value as FeedUnit | '')}>
            <option value="">stated in the file</option>
            {speedUnits.map((u) => (
              <option value={u}>{u}</option>
            ))}
          </select>
        </Field>
        <Field id="ff-height" label="Height of the forecast speeds" unit="m" error={e('forecastFeedHeightM')} help="Forecasts give the wind at 10 m.">
          <input id="ff-height" inputMode="decimal" value={height} onInput={(ev) => setHeight(ev.currentTarget.value)} />
        </Field>
      </div>
      {message ? (
        <p class={message.ok ? 'ok-box' : 'error-box'} role={message.ok ? 'status' : 'alert'}>
          {message.text}
        </p>
      ) : null}
      <div class="row save-row">
        <button type="button" disabled={busy} onClick={() => void save()}>
          {busy ? 'Saving…' : 'Save the forecast feed'}
        </button>
      </div>
    </section>
  );
}
