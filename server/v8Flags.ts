/**
 * V8 flags the server sets while it runs (heapSettings.ts), kept so they can be set again: in
 * Node 20, starting a worker thread puts V8's flags back to what the command line gave, for the
 * whole process. Seen on the benchmark machine: with the growth factor set to 1, the main
 * thread's young generation stayed at 2 MB without a worker and grew to 32 MB once one had
 * started; set again once the worker is online, it stayed at 2 MB. storage/workerScript.ts calls
 * `reapplyRuntimeV8Flags` when each of its workers is online. Nothing is set on import: tests
 * and tools, which never call `setRuntimeV8Flag`, keep V8's defaults.
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
