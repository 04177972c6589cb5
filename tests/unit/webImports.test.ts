/**
 * The web app reaches server/ modules (the engine, the levels, the words) by their files, and none
 * of what it imports brings zod: the app checks nothing with zod schemas, and zod in the bundle
 * was about 25 kB of its gzipped JavaScript (npm run bench, benchmark 6: 158.6 → 133.6 kB, target
 * ≤ 150 kB). A walk over the value imports (`import type` is erased) from web/src/main.tsx.
 */
import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

function valueImports(file: string): string[] {
  const src = fs.readFileSync(file, 'utf8');
  const found: string[] = [];
  for (const m of src.matchAll(/^\s*(import|export)\s+(type\s+)?[^'";]*?from\s+'([^']+)'/gm)) if (!m[2]) found.push(m[3]!);
  for (const m of src.matchAll(/^\s*import\s+'([^']+)'/gm)) found.push(m[1]!);
  for (const m of src.matchAll(/import\('([^']+)'\)/g)) found.push(m[1]!);
  return found;
}

/** Every package the app's value imports reach, with one chain of files that reaches it. */
function packagesReached(entry: string): Map<string, string[]> {
  const packages = new Map<string, string[]>();
  const seen = new Set<string>();
  const walk = (file: string, chain: string[]): void => {
    if (seen.has(file)) return;
    seen.add(file);
    for (const spec of valueImports(file)) {
      if (!spec.startsWith('.')) {
        const name = spec.startsWith('@') ? spec.split('/').slice(0, 2).join('/') : spec.split('/')[0]!;
        if (!packages.has(name)) packages.set(name, [...chain, path.relative(process.cwd(), file)]);
        continue;
      }
      const target = path.resolve(path.dirname(file), spec);
      if (fs.existsSync(target) && fs.statSync(target).isFile()) walk(target, [...chain, path.relative(process.cwd(), file)]);
    }
  };
  walk(path.resolve(entry), []);
  return packages;
}

describe("the web app's imports", () => {
  it('reach preact and the chart library, and not zod', () => {
    const reached = packagesReached('web/src/main.tsx');
    expect(reached.has('preact')).toBe(true);
    expect(reached.has('uplot')).toBe(true);
    expect(reached.get('zod') ?? null).toBeNull();
  });
});
