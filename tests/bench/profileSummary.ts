/**
 * Reads a V8 .cpuprofile (from `node --cpu-prof`, or a benchmark run with BENCH_PROFILE=1) and
 * prints the functions that took the most time: self time (the function's own code) and total
 * time (with everything it called), with file and line.
 *
 *   node --import tsx tests/bench/profileSummary.ts <file.cpuprofile> [top=25] [filter]
 *   node --import tsx tests/bench/profileSummary.ts <file.cpuprofile> --long [minMs=20]
 *   node --import tsx tests/bench/profileSummary.ts <file.heapprofile> --allocations [top=25]
 *
 * `filter` keeps only functions whose file path contains it (e.g. `server/`). `--long` lists the
 * long tasks instead: stretches of busy samples (no idle sample between them) of at least
 * `minMs`, each with the functions that took most of it (with callees) — what blocks the event
 * loop, and so what a reading that arrives meanwhile waits for. `--allocations` reads a sampling
 * heap profile (serverHook.ts BENCH_ALLOCATION_DIR) and lists the functions that allocated most,
 * by their own allocations.
 */
import fs from 'node:fs';
import path from 'node:path';

interface ProfileNode {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number; columnNumber: number };
  hitCount?: number;
  children?: number[];
}

interface CpuProfile {
  nodes: ProfileNode[];
  startTime: number;
  endTime: number;
  samples?: number[];
  timeDeltas?: number[];
}

export interface FunctionTime {
  name: string;
  where: string;
  selfMs: number;
  totalMs: number;
}

function label(node: ProfileNode): { key: string; name: string; where: string } {
  const f = node.callFrame;
  const name = f.functionName || '(anonymous)';
  const url = f.url.replace(/^file:\/\//, '');
  const rel = url ? path.relative(process.cwd(), url) : '';
  const where = rel ? `${rel}:${f.lineNumber + 1}` : '';
  return { key: `${name}@${where}`, name, where };
}

export function summarize(profile: CpuProfile): { totalMs: number; functions: FunctionTime[] } {
  const byId = new Map(profile.nodes.map((n) => [n.id, n]));
  const parent = new Map<number, number>();
  for (const n of profile.nodes) for (const c of n.children ?? []) parent.set(c, n.id);
  // Time per node from the samples (hitCount × mean interval when there are no deltas).
  const selfUs = new Map<number, number>();
  if (profile.samples && profile.timeDeltas && profile.samples.length === profile.timeDeltas.length) {
    for (let i = 0; i < profile.samples.length; i++) {
      const id = profile.samples[i]!;
      const dt = profile.timeDeltas[i + 1] ?? profile.timeDeltas[i] ?? 0;
      selfUs.set(id, (selfUs.get(id) ?? 0) + Math.max(0, dt));
    }
  } else {
    const hits = profile.nodes.reduce((n, x) => n + (x.hitCount ?? 0), 0);
    const per = hits > 0 ? (profile.endTime - profile.startTime) / hits : 0;
    for (const n of profile.nodes) selfUs.set(n.id, (n.hitCount ?? 0) * per);
  }
  const fns = new Map<string, FunctionTime>();
  const get = (n: ProfileNode): FunctionTime => {
    const l = label(n);
    let f = fns.get(l.key);
    if (!f) {
      f = { name: l.name, where: l.where, selfMs: 0, totalMs: 0 };
      fns.set(l.key, f);
    }
    return f;
  };
  for (const [id, us] of selfUs) {
    const node = byId.get(id);
    if (!node || us === 0) continue;
    get(node).selfMs += us / 1000;
    // Inclusive: count once per distinct function on the stack (recursion counted once).
    const seen = new Set<string>();
    for (let cur: number | undefined = id; cur !== undefined; cur = parent.get(cur)) {
      const n = byId.get(cur)!;
      const l = label(n);
      if (seen.has(l.key)) continue;
      seen.add(l.key);
      get(n).totalMs += us / 1000;
    }
  }
  const totalMs = [...selfUs.values()].reduce((a, b) => a + b, 0) / 1000;
  return { totalMs, functions: [...fns.values()] };
}

/** Busy stretches of at least `minMs` and the functions (with callees) that filled them. */
export function longTasks(profile: CpuProfile, minMs: number): Array<{ startMs: number; durationMs: number; top: Array<{ name: string; where: string; ms: number }> }> {
  if (!profile.samples || !profile.timeDeltas) return [];
  const byId = new Map(profile.nodes.map((n) => [n.id, n]));
  const parent = new Map<number, number>();
  for (const n of profile.nodes) for (const c of n.children ?? []) parent.set(c, n.id);
  const idle = new Set(profile.nodes.filter((n) => n.callFrame.functionName === '(idle)').map((n) => n.id));
  const out: Array<{ startMs: number; durationMs: number; top: Array<{ name: string; where: string; ms: number }> }> = [];
  let t = profile.startTime;
  let taskStart = -1;
  let taskSamples: Array<{ id: number; us: number }> = [];
  const close = (end: number): void => {
    if (taskStart >= 0 && (end - taskStart) / 1000 >= minMs) {
      const per = new Map<string, { name: string; where: string; ms: number }>();
      for (const s of taskSamples) {
        const seen = new Set<string>();
        for (let cur: number | undefined = s.id; cur !== undefined; cur = parent.get(cur)) {
          const l = label(byId.get(cur)!);
          if (seen.has(l.key) || l.name === '(root)') continue;
          seen.add(l.key);
          const e = per.get(l.key) ?? { name: l.name, where: l.where, ms: 0 };
          e.ms += s.us / 1000;
          per.set(l.key, e);
        }
      }
      const top = [...per.values()].filter((e) => e.where.startsWith('server/') || e.where.startsWith('dist/server/') || e.where.includes('node_modules/') || e.name === '(garbage collector)').sort((a, b) => b.ms - a.ms).slice(0, 8);
      out.push({ startMs: (taskStart - profile.startTime) / 1000, durationMs: (end - taskStart) / 1000, top });
    }
    taskStart = -1;
    taskSamples = [];
  };
  for (let i = 0; i < profile.samples.length; i++) {
    t += profile.timeDeltas[i]!;
    const id = profile.samples[i]!;
    const us = profile.timeDeltas[i + 1] ?? 0;
    if (idle.has(id)) {
      close(t);
      continue;
    }
    if (taskStart < 0) taskStart = t;
    taskSamples.push({ id, us });
  }
  close(t);
  return out;
}

interface HeapProfileNode {
  callFrame: { functionName: string; url: string; lineNumber: number };
  selfSize: number;
  children: HeapProfileNode[];
}

/** Bytes allocated per function (own allocations), largest first. */
export function allocationsByFunction(head: HeapProfileNode): { totalBytes: number; functions: Array<{ name: string; where: string; bytes: number }> } {
  const per = new Map<string, { name: string; where: string; bytes: number }>();
  let totalBytes = 0;
  const stack: HeapProfileNode[] = [head];
  while (stack.length > 0) {
    const n = stack.pop()!;
    const l = label({ id: 0, callFrame: { ...n.callFrame, columnNumber: 0 } });
    const e = per.get(l.key) ?? { name: l.name, where: l.where, bytes: 0 };
    e.bytes += n.selfSize;
    per.set(l.key, e);
    totalBytes += n.selfSize;
    stack.push(...n.children);
  }
  return { totalBytes, functions: [...per.values()].sort((a, b) => b.bytes - a.bytes) };
}

function main(): void {
  const [file, topArg, filter] = process.argv.slice(2);
  if (file && topArg === '--allocations') {
    const { totalBytes, functions } = allocationsByFunction((JSON.parse(fs.readFileSync(file, 'utf8')) as { head: HeapProfileNode }).head);
    console.log(`${path.basename(file)}: ${(totalBytes / 2 ** 20).toFixed(1)} MB allocated (sampled)`);
    for (const f of functions.slice(0, Number(filter ?? 25))) console.log(`${(f.bytes / 2 ** 20).toFixed(1).padStart(8)} MB ${((100 * f.bytes) / totalBytes).toFixed(1).padStart(5)} %  ${f.name}  ${f.where}`);
    return;
  }
  if (file && topArg === '--long') {
    const minMs = Number(filter ?? 20);
    const tasks = longTasks(JSON.parse(fs.readFileSync(file, 'utf8')) as CpuProfile, minMs);
    console.log(`${tasks.length} busy stretches of ≥ ${minMs} ms`);
    for (const task of tasks) {
      console.log(`\nat ${(task.startMs / 1000).toFixed(3)} s: ${task.durationMs.toFixed(1)} ms`);
      for (const f of task.top) console.log(`  ${f.ms.toFixed(1).padStart(7)} ms  ${f.name}  ${f.where}`);
    }
    return;
  }
  if (!file) {
    console.error('usage: profileSummary.ts <file.cpuprofile> [top] [path filter]');
    process.exit(2);
  }
  const top = Number(topArg ?? 25);
  const { totalMs, functions } = summarize(JSON.parse(fs.readFileSync(file, 'utf8')) as CpuProfile);
  const keep = (f: FunctionTime): boolean => !filter || f.where.includes(filter);
  const pct = (ms: number): string => `${((100 * ms) / totalMs).toFixed(1).padStart(5)} %`;
  console.log(`${path.basename(file)}: ${(totalMs / 1000).toFixed(2)} s sampled`);
  console.log('\nself time');
  for (const f of functions.filter(keep).sort((a, b) => b.selfMs - a.selfMs).slice(0, top)) {
    console.log(`${f.selfMs.toFixed(0).padStart(8)} ms ${pct(f.selfMs)}  ${f.name}  ${f.where}`);
  }
  console.log('\ntotal time (with callees)');
  for (const f of functions.filter(keep).sort((a, b) => b.totalMs - a.totalMs).slice(0, top)) {
    console.log(`${f.totalMs.toFixed(0).padStart(8)} ms ${pct(f.totalMs)}  ${f.name}  ${f.where}`);
  }
}

if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(new URL(import.meta.url).pathname)) main();
