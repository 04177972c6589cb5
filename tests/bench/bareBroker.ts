/**
 * The embedded broker's baselines, run as a child process (`fork`, IPC) like the server, on
 * 127.0.0.1 and an ephemeral port:
 *
 * - `subscriber` — aedes with no hooks plus a counting mqtt.js subscriber (QoS 1) in the same
 *   process: the "bare mqtt.js subscriber that only counts, same broker and publisher" of the
 *   design's target (design.md 6), and the target's baseline.
 * - `hook` — aedes exactly as the server builds it (Aedes.createBroker, one net server), with an
 *   `authorizePublish` that only counts and calls back at once. Stricter than the target: the
 *   subscriber baseline pays a forwarding hop (serialize, socket, parse, PUBACK) that the server,
 *   which takes each reading in that very hook, does not. The difference between server and hook
 *   is exactly what the server adds per reading (topic → sensor, payload parsing, wind state,
 *   assessing 1,000 structures, the group commit); printed for information.
 */
import { createServer, type AddressInfo } from 'node:net';
import { Aedes } from 'aedes';
import mqtt from 'mqtt';
import { wallMs } from './common.ts';

export type BareCommand = { cmd: 'start'; mode: 'hook' | 'subscriber'; topicFilter: string } | { cmd: 'expect'; count: number } | { cmd: 'close' };

export type BareReply =
  | { kind: 'listening'; port: number }
  | { kind: 'counted'; count: number; firstAtMs: number; lastAtMs: number }
  | { kind: 'error'; message: string };

let counted = 0;
let firstAtMs = 0;
let expected = Number.POSITIVE_INFINITY;
let reported = false;

function count(): void {
  if (counted === 0) firstAtMs = wallMs();
  counted++;
  if (!reported && counted >= expected) {
    reported = true;
    process.send?.({ kind: 'counted', count: counted, firstAtMs, lastAtMs: wallMs() } satisfies BareReply);
  }
}

let close: () => Promise<void> = async () => undefined;

async function start(mode: 'hook' | 'subscriber', topicFilter: string): Promise<void> {
  const aedes = await Aedes.createBroker(
    mode === 'hook'
      ? {
          authorizePublish: (client, _packet, callback) => {
            if (client) count();
            callback(null);
          },
        }
      : {},
  );
  const server = createServer(aedes.handle);
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', () => resolve()));
  const port = (server.address() as AddressInfo).port;
  let sub: mqtt.MqttClient | null = null;
  if (mode === 'subscriber') {
    sub = mqtt.connect(`mqtt://127.0.0.1:${port}`, { clientId: 'bench-bare-subscriber', clean: true, reconnectPeriod: 0, protocolVersion: 4 });
    sub.on('message', () => count());
    await new Promise<void>((resolve, reject) => {
      sub!.once('connect', () => sub!.subscribe(topicFilter, { qos: 1 }, (err) => (err ? reject(err) : resolve())));
      sub!.once('error', reject);
    });
  }
  close = async () => {
    await sub?.endAsync(true);
    await new Promise<void>((resolve) => aedes.close(() => resolve()));
    await new Promise<void>((resolve) => server.close(() => resolve()));
  };
  process.send?.({ kind: 'listening', port } satisfies BareReply);
}

process.on('message', (message: BareCommand) => {
  const run = async (): Promise<void> => {
    switch (message.cmd) {
      case 'start':
        return start(message.mode, message.topicFilter);
      case 'expect':
        // Counts from here: everything before (the warm-up) is forgotten.
        counted = 0;
        reported = false;
        expected = message.count;
        return;
      case 'close':
        await close();
        process.exit(0);
    }
  };
  run().catch((err: unknown) => process.send?.({ kind: 'error', message: err instanceof Error ? err.message : String(err) } satisfies BareReply));
});
process.on('disconnect', () => process.exit(0));
