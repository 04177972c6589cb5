/**
 * Small helpers shared by the benchmarks: wall-clock time, child processes spoken to over IPC,
 * resident-memory sampling from /proc, a private Mosquitto, percentiles.
 */
import { execFileSync, fork, spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { performance } from 'node:perf_hooks';

/** Wall-clock ms with sub-ms resolution, comparable between processes on one machine. */
export const wallMs = (): number => performance.timeOrigin + performance.now();

export const sleep = (ms: number): Promise<void> => new Promise((r) => setTimeout(r, ms));

/** Every process the benchmarks start, so a run that fails half-way leaves none behind (`killTracked`). */
const tracked = new Set<ChildProcess>();

export function track(proc: ChildProcess): ChildProcess {
  tracked.add(proc);
  proc.once('exit', () => tracked.delete(proc));
  return proc;
}

/** SIGKILLs every tracked process still running (each by its own pid). */
export function killTracked(): void {
  for (const proc of tracked) {
    if (proc.exitCode === null && proc.signalCode === null) proc.kill('SIGKILL');
  }
  tracked.clear();
}

/** A child process running one of the benchmark scripts under tsx, spoken to over IPC. */
export class Child<Cmd, Reply extends { kind: string }> {
  readonly proc: ChildProcess;
  private readonly inbox: Reply[] = [];
  private waiter: (() => void) | null = null;
  private exited = false;
  private stderr = '';

  constructor(script: string, env: Record<string, string> = {}) {
    this.proc = track(
      fork(path.resolve('tests/bench', script), [], {
        execArgv: ['--import', 'tsx'],
        env: { ...process.env, ...env },
        stdio: ['ignore', 'inherit', 'pipe', 'ipc'],
      }),
    );
    this.proc.stderr?.on('data', (d: Buffer) => {
      this.stderr = (this.stderr + d.toString()).slice(-4000);
    });
    this.proc.on('message', (m) => {
      this.inbox.push(m as Reply);
      this.waiter?.();
    });
    this.proc.on('exit', () => {
      this.exited = true;
      this.waiter?.();
    });
  }

  send(cmd: Cmd): void {
    this.proc.send(cmd as object);
  }

  /** The next reply of this kind (an 'error' reply throws); throws after `timeoutMs`. */
  async next<K extends Reply['kind']>(kind: K, timeoutMs: number): Promise<Extract<Reply, { kind: K }>> {
    const deadline = Date.now() + timeoutMs;
    for (;;) {
      const i = this.inbox.findIndex((m) => m.kind === kind || m.kind === 'error');
      if (i >= 0) {
        const m = this.inbox.splice(i, 1)[0]!;
        if (m.kind === 'error') throw new Error(`${path.basename(String(this.proc.spawnargs.at(-1)))}: ${(m as unknown as { message: string }).message}`);
        return m as Extract<Reply, { kind: K }>;
      }
      if (this.exited) throw new Error(`child exited while waiting for "${kind}": ${this.stderr}`);
      const left = deadline - Date.now();
      if (left <= 0) throw new Error(`timed out after ${timeoutMs} ms waiting for "${kind}" from a child process`);
      await new Promise<void>((resolve) => {
        const t = setTimeout(resolve, left);
        this.waiter = () => {
          clearTimeout(t);
          resolve();
        };
      });
      this.waiter = null;
    }
  }

  async kill(): Promise<void> {
    if (this.exited) return;
    await new Promise<void>((resolve) => {
      this.proc.once('exit', () => resolve());
      this.proc.kill('SIGKILL');
    });
  }
}

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const port = (s.address() as net.AddressInfo).port;
      s.close(() => resolve(port));
    });
  });
}

async function portOpen(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const s = net.connect(port, '127.0.0.1', () => {
      s.end();
      resolve(true);
    });
    s.on('error', () => resolve(false));
  });
}

export function hasBinary(name: string): boolean {
  try {
    execFileSync('which', [name], { stdio: 'ignore' });
    return true;
  } catch {
    return false;
  }
}

/**
 * A private Mosquitto on 127.0.0.1 and a free port, with an unlimited queue
 * (`max_queued_messages 0`: the default of 1000 drops readings for a subscriber that falls
 * behind) and no persistence file (nothing here outlives the run).
 */
export async function startMosquitto(dir: string): Promise<{ url: string; port: number; proc: ChildProcess; stop: () => Promise<void> }> {
  fs.mkdirSync(dir, { recursive: true });
  const port = await freePort();
  const conf = path.join(dir, 'mosquitto.conf');
  fs.writeFileSync(conf, `listener ${port} 127.0.0.1\nallow_anonymous true\nmax_queued_messages 0\nmax_queued_bytes 0\npersistence false\n`);
  const proc = track(spawn('mosquitto', ['-c', conf], { stdio: 'ignore' }));
  const deadline = Date.now() + 5_000;
  while (!(await portOpen(port))) {
    if (Date.now() > deadline || proc.exitCode !== null) throw new Error('mosquitto did not start listening within 5 s');
    await sleep(20);
  }
  return {
    url: `mqtt://127.0.0.1:${port}`,
    port,
    proc,
    stop: () =>
      new Promise<void>((resolve) => {
        if (proc.exitCode !== null || proc.signalCode !== null) return resolve();
        proc.once('exit', () => resolve());
        proc.kill('SIGKILL');
      }),
  };
}

let clockTicksPerS: number | null = null;

/**
 * CPU time a process has used so far (user + system, all its threads), seconds, from
 * /proc/<pid>/stat; null when unavailable. Unlike wall-clock rates, CPU time per reading hardly
 * changes with what else the machine is doing.
 */
export function cpuSeconds(pid: number, tid?: number): number | null {
  try {
    if (clockTicksPerS === null) {
      try {
        clockTicksPerS = Number(execFileSync('getconf', ['CLK_TCK'], { encoding: 'utf8' }).trim()) || 100;
      } catch {
        clockTicksPerS = 100;
      }
    }
    // With `tid`, one thread's (the main thread's tid is the pid): /proc/<pid>/task/<tid>/stat.
    const stat = fs.readFileSync(tid === undefined ? `/proc/${pid}/stat` : `/proc/${pid}/task/${tid}/stat`, 'utf8');
    // Fields after the command name (which may contain spaces) start after the last ')'.
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    const utime = Number(fields[11]);
    const stime = Number(fields[12]);
    if (!Number.isFinite(utime) || !Number.isFinite(stime)) return null;
    return (utime + stime) / clockTicksPerS;
  } catch {
    return null;
  }
}

/** VmRSS and VmHWM of a process, kB, from /proc (null when unavailable). */
export function procMemoryKb(pid: number): { rssKb: number; hwmKb: number } | null {
  try {
    const status = fs.readFileSync(`/proc/${pid}/status`, 'utf8');
    const rss = /VmRSS:\s+(\d+) kB/.exec(status);
    const hwm = /VmHWM:\s+(\d+) kB/.exec(status);
    if (!rss || !hwm) return null;
    return { rssKb: Number(rss[1]), hwmKb: Number(hwm[1]) };
  } catch {
    return null;
  }
}

/** Samples a process's VmRSS every `everyMs` until stopped; reports the highest and the last VmHWM. */
export function sampleMemory(pid: number, everyMs = 250): { stop: () => { maxRssKb: number; hwmKb: number; samples: number } } {
  let maxRssKb = 0;
  let hwmKb = 0;
  let samples = 0;
  const take = (): void => {
    const m = procMemoryKb(pid);
    if (!m) return;
    samples++;
    maxRssKb = Math.max(maxRssKb, m.rssKb);
    hwmKb = m.hwmKb;
  };
  take();
  const timer = setInterval(take, everyMs);
  return {
    stop: () => {
      take();
      clearInterval(timer);
      return { maxRssKb, hwmKb, samples };
    },
  };
}

/** The q-quantile (0..1) of values, nearest rank. */
export function quantile(values: readonly number[], q: number): number {
  if (values.length === 0) return Number.NaN;
  const sorted = [...values].sort((a, b) => a - b);
  const rank = Math.min(sorted.length - 1, Math.max(0, Math.ceil(q * sorted.length) - 1));
  return sorted[rank]!;
}

export const median = (values: readonly number[]): number => quantile(values, 0.5);
