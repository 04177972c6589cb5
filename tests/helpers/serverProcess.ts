/**
 * Runs the server as a separate process (`node --import tsx server/main.ts`), so a test can kill
 * it with SIGKILL mid-stream and start it again on the same data folder, as a crash would.
 * `compiled: true` runs `dist/server/main.js` instead, as `npm start` does (build first): the
 * benchmarks and the soak measure the server as shipped, without the tsx loader's memory, and
 * with the environment package.json's start script sets before node (`startScriptEnv`).
 */
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import readline from 'node:readline';

/**
 * The variables package.json's `start` script sets in front of `node dist/server/main.js`
 * (`NAME=value … node dist/server/main.js`), read from the script itself so a compiled server
 * started here runs as `npm start` runs it.
 */
export function startScriptEnv(): Record<string, string> {
  const scripts = (JSON.parse(fs.readFileSync('package.json', 'utf8')) as { scripts: Record<string, string> }).scripts;
  const found = /(?:^|&&\s*)((?:[A-Za-z_][A-Za-z0-9_]*=\S+\s+)*)node dist\/server\/main\.js/.exec(scripts.start ?? '');
  if (!found) throw new Error('package.json\'s start script does not run node dist/server/main.js');
  return Object.fromEntries(
    found[1]!
      .split(/\s+/)
      .filter((a) => a.length > 0)
      .map((a) => [a.slice(0, a.indexOf('=')), a.slice(a.indexOf('=') + 1)]),
  );
}

export interface ServerProcess {
  proc: ChildProcess;
  httpPort: number;
  mqttPort: number | null;
  /** Every JSON log line so far. */
  logLines: Array<Record<string, unknown>>;
  kill(signal?: NodeJS.Signals): Promise<void>;
}

export async function spawnServer(env: Record<string, string>, timeoutMs = 20_000, options: { compiled?: boolean } = {}): Promise<ServerProcess> {
  const args = options.compiled ? ['dist/server/main.js'] : ['--import', 'tsx', 'server/main.ts'];
  const proc = spawn(process.execPath, args, {
    cwd: process.cwd(),
    env: { ...process.env, ...(options.compiled ? startScriptEnv() : {}), HOST: '127.0.0.1', MQTT_HOST: '127.0.0.1', PORT: '0', LOG_LEVEL: 'info', ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const logLines: Array<Record<string, unknown>> = [];
  let stderr = '';
  proc.stderr!.on('data', (d: Buffer) => (stderr += d.toString()));
  const lines = readline.createInterface({ input: proc.stdout! });
  const started = new Promise<{ httpPort: number; mqttPort: number | null }>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`server did not start in ${timeoutMs} ms; stderr: ${stderr.slice(-2000)}`)), timeoutMs);
    lines.on('line', (line) => {
      let entry: Record<string, unknown>;
      try {
        entry = JSON.parse(line) as Record<string, unknown>;
      } catch {
        return;
      }
      logLines.push(entry);
      if (entry.msg === 'server started') {
        clearTimeout(timer);
        const url = new URL(String(entry.url));
        resolve({ httpPort: Number(url.port), mqttPort: typeof entry.mqttPort === 'number' ? entry.mqttPort : null });
      }
      if (entry.level === 60) {
        clearTimeout(timer);
        reject(new Error(`server failed to start: ${String(entry.msg)}`));
      }
    });
    proc.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`server exited with ${code} before starting; stderr: ${stderr.slice(-2000)}`));
    });
  });
  const { httpPort, mqttPort } = await started;
  return {
    proc,
    httpPort,
    mqttPort,
    logLines,
    kill: (signal = 'SIGKILL') =>
      new Promise<void>((resolve) => {
        if (proc.exitCode !== null || proc.signalCode !== null) return resolve();
        proc.once('exit', () => resolve());
        proc.kill(signal);
      }),
  };
}
