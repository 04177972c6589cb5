/**
 * A QR code (ISO/IEC 18004) of a link, for phones to scan off a screen at a crew briefing. The
 * encoder (uqr) is loaded only when a code is shown. Dark modules on white with the standard's
 * four-module quiet zone, whatever the app's colour scheme: phone cameras read that reliably,
 * inverted codes less so. Error correction M (about 15 % of the modules may be lost: a scratched
 * or glare-struck screen).
 */
import { useEffect, useState } from 'preact/hooks';

interface Drawn {
  size: number;
  path: string;
}

/** One square per dark module, as a single SVG path. */
export function modulesPath(data: readonly (readonly boolean[])[]): string {
  const parts: string[] = [];
  data.forEach((row, y) => row.forEach((dark, x) => dark && parts.push(`M${x} ${y}h1v1h-1z`)));
  return parts.join('');
}

export function ScanCode({ text, label }: { text: string; label: string }) {
  const [drawn, setDrawn] = useState<Drawn | null>(null);
  const [failed, setFailed] = useState(false);
  useEffect(() => {
    let current = true;
    setDrawn(null);
    setFailed(false);
    import('./scanCodeEncoder.ts')
      .then(({ encode }) => {
        const qr = encode(text, { ecc: 'M', border: 4 });
        if (current) setDrawn({ size: qr.size, path: modulesPath(qr.data) });
      })
      .catch(() => current && setFailed(true));
    return () => {
      current = false;
    };
  }, [text]);
  if (failed) return <p class="help">The scan code could not be drawn; copy the link instead.</p>;
  if (!drawn) return <p class="help">Drawing the scan code…</p>;
  return (
    <svg class="scan-code" viewBox={`0 0 ${drawn.size} ${drawn.size}`} role="img" aria-label={label} shape-rendering="crispEdges" data-testid="scan-code">
      <rect width={drawn.size} height={drawn.size} fill="#fff" />
      <path d={drawn.path} fill="#000" />
    </svg>
  );
}
