/**
 * Child process of the fan-out benchmark (fanout.ts): many live-stream clients (Server-Sent
 * Events over plain HTTP/1.1, one socket each, as many phones would), each reading as fast as the
 * server sends and counting the bytes it receives. Kept out of the benchmark's own process so its
 * parsing does not share an event loop with anything timed.
 */
import http from 'node:http';
import { performance } from 'node:perf_hooks';

export type StreamClientsCommand =
  | { cmd: 'open'; url: string; cookie: string; count: number }
  | { cmd: 'measure-start' }
  | { cmd: 'measure' }
  | { cmd: 'close' };

export type StreamClientsReply =
  /** Every stream open and its first snapshot read to its end. */
  | { kind: 'opened'; open: number; snapshotsRead: number }
  | { kind: 'measured'; seconds: number; bytesPerClient: number[]; open: number; snapshots: number }
  | { kind: 'closed' }
  | { kind: 'error'; message: string };

interface Client {
  req: http.ClientRequest;
  bytes: number;
  open: boolean;
  snapshots: number;
  /** Its first snapshot event read to its end (the blank line after it: its JSON has no line break). */
  firstSnapshotRead: boolean;
}

let clients: Client[] = [];
let measureFrom = performance.now();
const send = (reply: StreamClientsReply): void => void process.send?.(reply);

function openOne(url: string, cookie: string): Promise<Client> {
  return new Promise((resolve, reject) => {
    const client: Client = { req: null as unknown as http.ClientRequest, bytes: 0, open: false, snapshots: 0, firstSnapshotRead: false };
    client.req = http.get(`${url}/api/stream`, { agent: false, headers: { cookie, accept: 'text/event-stream' } }, (res) => {
      if (res.statusCode !== 200) {
        reject(new Error(`GET /api/stream answered ${res.statusCode}`));
        res.resume();
        return;
      }
      client.open = true;
      let tail = '';
      res.on('data', (chunk: Buffer) => {
        client.bytes += chunk.length;
        // Count snapshots (a client dropped and resumed gets one): "event: snapshot" may straddle chunks.
        const text = tail + chunk.toString('latin1');
        let at = text.indexOf('event: snapshot');
        while (at >= 0) {
          client.snapshots++;
          at = text.indexOf('event: snapshot', at + 1);
        }
        if (!client.firstSnapshotRead && client.snapshots > 0) {
          // The first blank line after the snapshot's event line ends it.
          const from = Math.max(0, text.indexOf('event: snapshot'));
          if (text.indexOf('\n\n', from) >= 0) client.firstSnapshotRead = true;
        }
        tail = text.slice(-16);
      });
      res.on('end', () => (client.open = false));
      res.on('error', () => (client.open = false));
      resolve(client);
    });
    client.req.on('error', reject);
  });
}

process.on('message', (m: StreamClientsCommand) => {
  void (async () => {
    try {
      if (m.cmd === 'open') {
        for (let i = 0; i < m.count; i += 50) {
          const batch = await Promise.all(Array.from({ length: Math.min(50, m.count - i) }, () => openOne(m.url, m.cookie)));
          clients.push(...batch);
        }
        // Until every client has read its first snapshot (or its stream has ended), at most 110 s.
        const deadline = performance.now() + 110_000;
        while (clients.some((c) => c.open && !c.firstSnapshotRead) && performance.now() < deadline) await new Promise((resolve) => setTimeout(resolve, 100));
        send({ kind: 'opened', open: clients.filter((c) => c.open).length, snapshotsRead: clients.filter((c) => c.firstSnapshotRead).length });
      } else if (m.cmd === 'measure-start') {
        for (const c of clients) {
          c.bytes = 0;
          c.snapshots = 0;
        }
        measureFrom = performance.now();
      } else if (m.cmd === 'measure') {
        const seconds = (performance.now() - measureFrom) / 1000;
        send({ kind: 'measured', seconds, bytesPerClient: clients.map((c) => c.bytes), open: clients.filter((c) => c.open).length, snapshots: clients.reduce((n, c) => n + c.snapshots, 0) });
      } else if (m.cmd === 'close') {
        for (const c of clients) c.req.destroy();
        clients = [];
        send({ kind: 'closed' });
        process.exit(0);
      }
    } catch (err) {
      send({ kind: 'error', message: err instanceof Error ? err.message : String(err) });
    }
  })();
});
