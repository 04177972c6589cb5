/**
 * Starts one of storage/'s worker threads (commitWorker, checkpointWorker) from the script beside
 * this file: the compiled JavaScript, or (tests, tsx) the TypeScript source loaded through tsx.
 */
import { createRequire } from 'node:module';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Worker, type ResourceLimits } from 'node:worker_threads';
import { reapplyRuntimeV8Flags } from '../v8Flags.ts';

export function startStorageWorker(name: 'commitWorker' | 'checkpointWorker', workerData: unknown, resourceLimits: ResourceLimits): Worker {
  const here = fileURLToPath(import.meta.url);
  const ext = path.extname(here);
  const script = pathToFileURL(path.join(path.dirname(here), `${name}${ext}`));
  // None of the main thread's preloads (NODE_OPTIONS --import, a profiler hook say): the worker needs none.
  const execArgv: string[] = [];
  const env = { ...process.env };
  delete env.NODE_OPTIONS;
  let worker: Worker;
  if (ext !== '.ts') worker = new Worker(script, { workerData, resourceLimits, execArgv, env });
  else {
    const tsx = pathToFileURL(createRequire(import.meta.url).resolve('tsx/esm/api')).href;
    const boot = `import(${JSON.stringify(tsx.replace(/index\.cjs$/, 'index.mjs'))}).then((m) => { m.register(); return import(${JSON.stringify(script.href)}); })`;
    worker = new Worker(boot, { eval: true, workerData, resourceLimits, execArgv, env });
  }
  // A worker's start puts the process's V8 flags back to the command line's (v8Flags.ts): set
  // them again once it runs, and once it first answers (under tsx, the loader thread that tsx
  // starts inside the worker resets them once more).
  worker.once('online', reapplyRuntimeV8Flags);
  worker.once('message', reapplyRuntimeV8Flags);
  return worker;
}
