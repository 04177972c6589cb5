/**
 * Site links (competent person): a URL that opens the live board read-only without an account,
 * until it expires or is withdrawn — for stewards, by message, or scanned off this screen at a
 * briefing (the QR code is shown with the link, once, like the link itself). Links are made with
 * the configured public address (PUBLIC_URL); without one, with the address this browser used,
 * and the screen warns that phones on another network may not reach it.
 */
import { useEffect, useState } from 'preact/hooks';
import { api, errorText } from '../api.ts';
import { Field } from '../components/field.tsx';
import { ScanCode } from '../components/scanCode.tsx';
import { useTimeZone } from '../site.ts';
import type { LinkAddress, SiteLink } from '../types.ts';
import { dateTime } from '../units.ts';
import { maxNameLength } from '../../../server/engine/limits.ts';
import { typedNumber } from '../register/structureDraft.ts';

export function SiteLinks() {
  const tz = useTimeZone();
  const [links, setLinks] = useState<SiteLink[] | null>(null);
  const [label, setLabel] = useState('');
  const [hours, setHours] = useState('72');
  const [made, setMade] = useState<{ url: string; label: string; expiresAtMs: number; linkAddress?: LinkAddress } | null>(null);
  const [address, setAddress] = useState<LinkAddress | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [reload, setReload] = useState(0);
  const [copied, setCopied] = useState(false);

  useEffect(() => {
    api<{ siteLinks: SiteLink[]; linkAddress: LinkAddress }>('/api/site-links')
      .then((a) => {
        setLinks(a.siteLinks);
        setAddress(a.linkAddress);
      })
      .catch((err) => setError(errorText(err)));
  }, [reload]);

  const create = async (e: Event) => {
    e.preventDefault();
    setError(null);
    try {
      const h = typedNumber(hours);
      const answer = await api<{ url: string; label: string; expiresAtMs: number; linkAddress: LinkAddress }>('/api/site-links', { body: { label: label.trim(), validHours: h ?? hours } });
      setMade(answer);
      setAddress(answer.linkAddress);
      setCopied(false);
      setLabel('');
      setReload(reload + 1);
    } catch (err) {
      setError(errorText(err));
    }
  };
  const revoke = async (l: SiteLink) => {
    if (!confirm(`Withdraw the link “${l.label}”? Phones using it lose the board at once.`)) return;
    try {
      await api(`/api/site-links/${l.id}`, { method: 'DELETE' });
      setReload(reload + 1);
    } catch (err) {
      setError(errorText(err));
    }
  };
  const now = Date.now();

  return (
    <main id="main">
      <h1>Site links</h1>
      <p class="help">A site link opens the live board and the log read-only, without an account, until it expires or you withdraw it. Send it to stewards by message or let them scan its code; anyone holding it can watch.</p>
      {address ? <LinkAddressLine address={address} /> : null}
      {error ? <p class="error-box">{error}</p> : null}
      {made ? (
        <div class="secret-box" role="status">
          <h2>Link for “{made.label}”</h2>
          <p>Shown once: copy it or let phones scan it now. Works until {dateTime(made.expiresAtMs, tz)}.</p>
          <p class="secret">
            <code data-testid="site-link-url">{made.url}</code>
          </p>
          {made.linkAddress?.warning ? (
            <p class="link-warning" role="note" data-testid="made-link-warning">
              ⚠ This link uses the address this browser reached the server at: phones on another network may not open it.
            </p>
          ) : null}
          <div class="row">
            <button type="button" onClick={() => navigator.clipboard?.writeText(made.url).then(() => setCopied(true))}>
              {copied ? 'Copied' : 'Copy link'}
            </button>
          </div>
          <ScanCode text={made.url} label={`Scan code of the site link for ${made.label}`} />
          <p class="help">Point a phone camera at the code to open the board. Anyone who can see this screen can scan it.</p>
          <div class="row">
            <button type="button" onClick={() => setMade(null)}>
              Done
            </button>
          </div>
        </div>
      ) : null}
      <form class="panel stack" onSubmit={create}>
        <h2>Make a link</h2>
        <div class="grid2">
          <Field id="sl-label" label="For whom" help="E.g. “Gate stewards, Saturday”. Shown in the audit trail.">
            <input id="sl-label" maxLength={maxNameLength} value={label} onInput={(e) => setLabel(e.currentTarget.value)} />
          </Field>
          <Field id="sl-hours" label="Valid for" unit="hours" help="At most 744 h (31 days). Default 72 h.">
            <input id="sl-hours" inputMode="decimal" value={hours} onInput={(e) => setHours(e.currentTarget.value)} />
          </Field>
        </div>
        <button type="submit" class="primary">
          Make link
        </button>
      </form>
      <h2>Links</h2>
      {links && links.length === 0 ? <p class="muted">No links yet.</p> : null}
      <ul class="plain-list">
        {(links ?? []).map((l) => {
          const over = l.revokedAtMs !== null || l.expiresAtMs <= now;
          return (
            <li class={`gw-item${over ? ' revoked' : ''}`} key={l.id}>
              <p>
                <strong>{l.label}</strong> — by {l.createdBy}, {dateTime(l.createdAtMs, tz)} · {l.revokedAtMs !== null ? `withdrawn ${dateTime(l.revokedAtMs, tz)}` : l.expiresAtMs <= now ? 'expired' : `until ${dateTime(l.expiresAtMs, tz)}`}
              </p>
              {!over ? (
                <div class="row">
                  <button type="button" class="danger" onClick={() => void revoke(l)}>
                    Withdraw
                  </button>
                </div>
              ) : null}
            </li>
          );
        })}
      </ul>
    </main>
  );
}

/** Which address the links carry: PUBLIC_URL, or this request's own with the warning. */
function LinkAddressLine({ address }: { address: LinkAddress }) {
  if (address.source === 'PUBLIC_URL') {
    return (
      <p class="ok-box" data-testid="link-address">
        Links use the site’s public address <code>{address.origin}</code> (PUBLIC_URL).
      </p>
    );
  }
  return (
    <div class="link-warning-box" role="note" data-testid="link-address">
      <p>
        <strong>⚠ Phones on another network may not reach these links.</strong>
      </p>
      <p>{address.warning}</p>
    </div>
  );
}
