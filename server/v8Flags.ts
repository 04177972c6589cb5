/**
 * V8 flags the server sets while it runs (heapSettings.ts), kept so they can be set again: in
 * Node 20, starting a worker thread undid the young generation's growth factor for the whole
 * process. Seen on the benchmark machine: with the factor set to 1 at run time, the main
 * thread's young generation stayed at 2 MB without a worker and grew to 32 MB once one had
 * started; set again once the worker was online, it stayed at 2 MB. A run-time `--trace-gc`
 * survived the same start, so not every flag is touched; from memory, V8 raises a growth factor
 * under 2 to 2 when it configures a new isolate's heap (not checked in V8's source).
 * storage/workerScript.ts calls `reapplyRuntimeV8Flags` when each of its workers is online and
 * when it first answers; heapSettings.ts sets the factor again after every collection as well,
 * for workers started elsewhere. Nothing is set on import: tests and tools, which never call
 * `setRuntimeV8Flag`, keep V8's defaults.
 */
import v8 from 'node:v8';

const flags = new Map<string, string>();

/** Sets `--name=value` now and again after each worker start. */
export function setRuntimeV8Flag(name: string, value: string | number): void {
  flags.set(name, `--${name}=${value}`);
  v8.setFlagsFromString(`--${name}=${value}`);
}

export function reapplyRuntimeV8Flags(): void {
  for (const flag of flags.values()) v8.setFlagsFromString(flag);
}
