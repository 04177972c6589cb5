/**
 * Ingest from an external broker (MQTT_URL): one persistent-session subscriber at QoS 1, written
 * on mqtt-packet (the packet codec mqtt.js and aedes use) rather than on mqtt.js itself.
 *
 * Why not mqtt.js: it hands over one message at a time and takes the next packet only after the
 * previous message's callback, which is where its PUBACK goes out. Acknowledging only after the
 * commit then costs one SQLite transaction per message (`npm run bench` measured a third of the
 * rate of a bare counting subscriber). Here every PUBLISH of one socket read is handed to the
 * pipeline in the same turn, so the write queue commits them together, and their PUBACKs go out
 * after that commit, in the order the PUBLISH packets came (MQTT 3.1.1 section 4.6, MQTT 5.0
 * section 4.6). Nothing is acknowledged before it is committed (or, while the disk cannot
 * write, held: see WriteQueue); a message whose handling fails is never acknowledged and the
 * connection is dropped so the broker delivers it again (readings are de-duplicated on sensor
 * and time).
 *
 * Transports: mqtt:// (TCP), mqtts:// (TLS, with MQTT_CA_FILE / MQTT_CERT_FILE / MQTT_KEY_FILE),
 * ws:// and wss:// (WebSocket, subprotocol "mqtt", via the ws package). Reconnects back off from
 * 1 s to 30 s and are reported in /api/health and the log.
 */
import fs from 'node:fs';
import net from 'node:net';
import tls from 'node:tls';
import type { Duplex } from 'node:stream';
import * as mqttPacket from 'mqtt-packet';
import WebSocket, { createWebSocketStream } from 'ws';
import type { Logger } from '../log.ts';
import type { ReadingSink } from './sink.ts';
import { readingTopicFilter } from './topic.ts';

export interface ExternalClientOptions {
  url: string;
  clientId: string;
  protocolVersion: 4 | 5;
  username: string | null;
  password: string | null;
  caFile: string | null;
  certFile: string | null;
  keyFile: string | null;
  topicPrefix: string;
  sink: ReadingSink;
  log: Logger;
  now?: () => number;
  /** First and longest wait between reconnect attempts. */
  minReconnectMs?: number;
  maxReconnectMs?: number;
  /** Keep-alive interval announced in CONNECT (seconds). */
  keepaliveS?: number;
  /** How long to wait for CONNACK after opening the connection. */
  connectTimeoutMs?: number;
}

export interface ExternalClientStatus {
  kind: 'external';
  url: string;
  /** subscription-refused: connected, but the broker refused the reading topics (its ACL): nothing can arrive. */
  state: 'connecting' | 'connected' | 'subscription-refused' | 'reconnecting' | 'offline' | 'stopped';
  sinceMs: number;
  reconnects: number;
  nextRetryMs: number;
  lastError: string | null;
}

/** One week: the broker keeps our session and queued messages through a long outage. */
const sessionExpirySeconds = 7 * 24 * 3600;
const subscribeMessageId = 1;

/** CONNACK refusals, MQTT 3.1.1 table 3.1 and MQTT 5.0 section 3.2.2.2. */
const refusals: Record<number, string> = {
  1: 'unacceptable protocol version',
  2: 'client identifier rejected',
  3: 'server unavailable',
  4: 'bad user name or password',
  5: 'not authorized',
  0x80: 'unspecified error',
  0x81: 'malformed packet',
  0x82: 'protocol error',
  0x84: 'unsupported protocol version',
  0x85: 'client identifier not valid',
  0x86: 'bad user name or password',
  0x87: 'not authorized',
  0x88: 'server unavailable',
  0x89: 'server busy',
  0x8a: 'banned',
  0x8c: 'bad authentication method',
  0x95: 'packet too large',
  0x97: 'quota exceeded',
  0x9f: 'connection rate exceeded',
};

/**
 * PUBACK (0x40), PUBREC (0x50) and PUBCOMP (0x70) are four bytes: type, remaining length 2, the
 * packet identifier. MQTT 5.0 (3.4.2.1) lets the reason code and properties be left out when the
 * reason is success, so the same bytes serve both protocol versions.
 */
const ackType = { puback: 0x40, pubrec: 0x50, pubcomp: 0x70 } as const;

interface PendingAck {
  /** Settles when the message is committed (or rejected and counted). */
  done: Promise<void> | null;
  type: number;
  messageId: number;
}

/** The client's options with the defaults filled in and the credentials resolved. */
type ConnectionSettings = ExternalClientOptions & { keepaliveS: number; connectTimeoutMs: number };

/** One network connection to the broker, from open to close. */
class Connection {
  private readonly parser: ReturnType<typeof mqttPacket.parser>;
  /** Acks of the socket read being handled now. */
  private chunkAcks: PendingAck[] = [];
  /** The last chunk's acks: each chunk writes its acks after the one before it. */
  private ackTail: Promise<void> = Promise.resolve();
  private keepaliveTimer: NodeJS.Timeout | null = null;
  private connackTimer: NodeJS.Timeout | null = null;
  private lastSentMs = Date.now();
  private lastReceivedMs = Date.now();
  closed = false;
  connected = false;

  constructor(
    readonly stream: Duplex,
    private readonly client: ExternalClient,
    private readonly o: ConnectionSettings,
  ) {
    this.parser = mqttPacket.parser({ protocolVersion: o.protocolVersion });
    this.parser.on('packet', (packet: mqttPacket.Packet) => this.onPacket(packet));
    this.parser.on('error', (err: Error) => this.fail(`malformed packet from the broker: ${err.message}`));
    stream.on('data', (chunk: Buffer) => this.onData(chunk));
    stream.on('error', (err: Error) => this.fail(err.message));
    stream.on('close', () => this.onClose());
    stream.on('end', () => this.fail('the broker closed the connection'));

    this.send(
      mqttPacket.generate(
        {
          cmd: 'connect',
          protocolId: 'MQTT',
          protocolVersion: o.protocolVersion,
          clientId: o.clientId,
          clean: false,
          keepalive: o.keepaliveS,
          ...(o.username !== null ? { username: o.username } : {}),
          ...(o.password !== null ? { password: Buffer.from(o.password) } : {}),
          ...(o.protocolVersion === 5 ? { properties: { sessionExpiryInterval: sessionExpirySeconds } } : {}),
        },
        { protocolVersion: o.protocolVersion },
      ),
    );
    this.connackTimer = setTimeout(() => this.fail(`no CONNACK within ${o.connectTimeoutMs} ms`), o.connectTimeoutMs);
    this.connackTimer.unref();
  }

  private send(bytes: Buffer): void {
    if (this.closed) return;
    this.lastSentMs = Date.now();
    this.stream.write(bytes);
  }

  private onData(chunk: Buffer): void {
    // After a failure or during a graceful end, nothing more is handed to the pipeline: it could
    // never be acknowledged on this connection, and the broker sends it again.
    if (this.closed) return;
    this.lastReceivedMs = Date.now();
    this.parser.parse(chunk);
    if (this.chunkAcks.length === 0 || this.closed) return;
    const acks = this.chunkAcks;
    this.chunkAcks = [];
    const waits = acks.filter((a) => a.done !== null).map((a) => a.done);
    const previous = this.ackTail;
    this.ackTail = Promise.all([previous, ...waits]).then(
      () => {
        if (this.closed) return;
        const bytes = Buffer.allocUnsafe(acks.length * 4);
        acks.forEach((a, i) => {
          bytes[i * 4] = a.type;
          bytes[i * 4 + 1] = 2;
          bytes.writeUInt16BE(a.messageId, i * 4 + 2);
        });
        this.send(bytes);
      },
      (err: unknown) => {
        // Withholding the ack only helps if the connection drops: the broker resends
        // unacknowledged messages on reconnect. Later chunks' acks are not sent either.
        this.o.log.error({ err: String(err) }, 'reading not committed; left unacknowledged for redelivery');
        this.fail(`reading not committed: ${String(err)}`);
      },
    );
  }

  private onPacket(packet: mqttPacket.Packet): void {
    switch (packet.cmd) {
      case 'publish': {
        const p = packet as mqttPacket.IPublishPacket;
        const payload = typeof p.payload === 'string' ? Buffer.from(p.payload) : p.payload;
        const done = this.o.sink.accept(p.topic, payload, (this.o.now ?? Date.now)());
        // Handled here at once: if this connection ends before the chunk's acks are chained (a
        // DISCONNECT later in the same read), a failed commit must not be an unhandled rejection.
        done.catch((err: unknown) => {
          if (p.qos === 0) this.o.log.error({ err: String(err), topic: p.topic }, 'QoS 0 reading not committed');
        });
        if (p.qos !== 0) {
          this.chunkAcks.push({ done, type: p.qos === 1 ? ackType.puback : ackType.pubrec, messageId: p.messageId ?? 0 });
        }
        return;
      }
      case 'pubrel':
        // Second half of a QoS 2 delivery: answered in order with the acks before it.
        this.chunkAcks.push({ done: null, type: ackType.pubcomp, messageId: packet.messageId ?? 0 });
        return;
      case 'connack':
        this.onConnack(packet as mqttPacket.IConnackPacket);
        return;
      case 'suback': {
        const granted = (packet as mqttPacket.ISubackPacket).granted as unknown[];
        const refused = granted.some((g) => typeof g === 'number' && g >= 0x80);
        if (refused) this.client.subscribeRefused(granted);
        return;
      }
      case 'disconnect': {
        const reason = (packet as mqttPacket.IDisconnectPacket).reasonCode;
        this.fail(`the broker disconnected${reason !== undefined ? ` (reason 0x${reason.toString(16)})` : ''}`);
        return;
      }
      default:
        // pingresp: lastReceivedMs already moved. Nothing else is expected by a subscriber.
        return;
    }
  }

  private onConnack(packet: mqttPacket.IConnackPacket): void {
    if (this.connackTimer) clearTimeout(this.connackTimer);
    this.connackTimer = null;
    const code = (this.o.protocolVersion === 5 ? packet.reasonCode : packet.returnCode) ?? 0;
    if (code !== 0) {
      this.fail(`the broker refused the connection: ${refusals[code] ?? `code ${code}`}`);
      return;
    }
    this.connected = true;
    // MQTT 5 (3.2.2.3.14): a keep-alive the broker sets in CONNACK is the one to use.
    const keepaliveS = (this.o.protocolVersion === 5 ? packet.properties?.serverKeepAlive : undefined) ?? this.o.keepaliveS;
    // Subscribing again on a present session is harmless and covers a lost subscription.
    this.send(
      mqttPacket.generate(
        { cmd: 'subscribe', messageId: subscribeMessageId, subscriptions: [{ topic: readingTopicFilter(this.o.topicPrefix), qos: 1 }] },
        { protocolVersion: this.o.protocolVersion },
      ),
    );
    this.client.connackReceived(packet.sessionPresent);
    if (keepaliveS <= 0) return; // keep-alive off: the broker does not expect pings
    const keepaliveMs = keepaliveS * 1000;
    this.keepaliveTimer = setInterval(() => {
      const now = Date.now();
      // The broker answers PINGREQ; silence for 1.5 keep-alive periods means a dead link
      // (MQTT 3.1.1 section 3.1.2.10).
      if (now - this.lastReceivedMs > keepaliveMs * 1.5) {
        this.fail(`no packet from the broker for ${Math.round((now - this.lastReceivedMs) / 1000)} s`);
      } else if (now - this.lastSentMs >= keepaliveMs / 2) {
        this.send(mqttPacket.generate({ cmd: 'pingreq' }, { protocolVersion: this.o.protocolVersion }));
      }
    }, keepaliveMs / 4);
    this.keepaliveTimer.unref();
  }

  /** Ends the connection after an error; the client decides whether to reconnect. */
  fail(reason: string): void {
    if (this.closed) return;
    this.client.connectionError(this, reason);
    this.stream.destroy();
    this.onClose();
  }

  private onClose(): void {
    if (this.closed) return;
    this.closed = true;
    if (this.connackTimer) clearTimeout(this.connackTimer);
    if (this.keepaliveTimer) clearInterval(this.keepaliveTimer);
    this.client.connectionClosed(this);
  }

  /** Graceful end: wait (bounded) for the acks of what was handed over, then DISCONNECT. */
  async end(waitMs: number): Promise<void> {
    if (this.closed) return;
    await Promise.race([this.ackTail.catch(() => undefined), sleep(waitMs)]);
    if (this.closed) return;
    const closedNow = new Promise<void>((resolve) => this.stream.once('close', () => resolve()));
    this.send(mqttPacket.generate({ cmd: 'disconnect' }, { protocolVersion: this.o.protocolVersion }));
    this.closed = true;
    if (this.connackTimer) clearTimeout(this.connackTimer);
    if (this.keepaliveTimer) clearInterval(this.keepaliveTimer);
    this.stream.end();
    await Promise.race([closedNow, sleep(waitMs)]);
    this.stream.destroy();
  }
}

export class ExternalClient {
  private connection: Connection | null = null;
  private retryTimer: NodeJS.Timeout | null = null;
  private readonly status: ExternalClientStatus;
  private readonly now: () => number;
  private readonly minMs: number;
  private readonly maxMs: number;
  private readonly credentials: { username: string | null; password: string | null };
  private firstConnect: { resolve: () => void; reject: (err: Error) => void } | null = null;

  constructor(private readonly options: ExternalClientOptions) {
    this.now = options.now ?? Date.now;
    this.minMs = options.minReconnectMs ?? 1_000;
    this.maxMs = options.maxReconnectMs ?? 30_000;
    this.status = {
      kind: 'external',
      url: redactUrl(options.url),
      state: 'connecting',
      sinceMs: this.now(),
      reconnects: 0,
      nextRetryMs: this.minMs,
      lastError: null,
    };
    this.credentials = credentialsOf(options);
  }

  /**
   * Starts connecting and resolves on the first CONNACK. The server does not wait for it: a
   * broker that is down at start is retried with back-off like any later outage.
   */
  start(): Promise<void> {
    const first = new Promise<void>((resolve, reject) => {
      this.firstConnect = { resolve, reject };
    });
    this.open();
    return first;
  }

  private open(): void {
    let stream: Duplex | null = null;
    try {
      stream = openStream(this.options);
      this.connection = new Connection(stream, this, {
        ...this.options,
        ...this.credentials,
        keepaliveS: this.options.keepaliveS ?? 30,
        connectTimeoutMs: this.options.connectTimeoutMs ?? 10_000,
      });
    } catch (err) {
      // A bad URL, an unreadable certificate file, a CONNECT the codec refuses: reported, and
      // retried like a broker outage (a certificate file may be fixed in place).
      stream?.destroy();
      this.status.lastError = err instanceof Error ? err.message : String(err);
      this.options.log.error({ url: this.status.url, err: this.status.lastError }, 'cannot open the MQTT connection');
      this.scheduleReconnect();
    }
  }

  /** @internal from Connection */
  connackReceived(sessionPresent: boolean): void {
    this.status.state = 'connected';
    this.status.sinceMs = this.now();
    this.status.nextRetryMs = this.minMs;
    this.options.log.info({ url: this.status.url, sessionPresent }, 'connected to MQTT broker');
    this.firstConnect?.resolve();
    this.firstConnect = null;
  }

  /** @internal from Connection */
  subscribeRefused(granted: unknown[]): void {
    this.status.state = 'subscription-refused';
    this.status.lastError = `the broker refused the subscription to the reading topics (${JSON.stringify(granted)}): check its access control list`;
    this.options.log.error({ url: this.status.url, granted }, 'could not subscribe to reading topics');
  }

  /** @internal from Connection */
  connectionError(connection: Connection, reason: string): void {
    if (connection !== this.connection || this.status.state === 'stopped') return;
    this.status.lastError = reason;
    this.options.log.error({ url: this.status.url, err: reason }, 'MQTT client error');
  }

  /** @internal from Connection */
  connectionClosed(connection: Connection): void {
    if (connection !== this.connection) return;
    this.connection = null;
    if (this.status.state === 'stopped') return;
    if (connection.connected) {
      this.status.state = 'offline';
      this.status.sinceMs = this.now();
      this.options.log.warn({ url: this.status.url }, 'MQTT broker connection lost');
    }
    this.scheduleReconnect();
  }

  private scheduleReconnect(): void {
    if (this.status.state === 'stopped' || this.retryTimer) return;
    const waitMs = this.status.nextRetryMs;
    if (this.status.state === 'connected' || this.status.state === 'subscription-refused') this.status.state = 'offline';
    this.retryTimer = setTimeout(() => {
      this.retryTimer = null;
      if (this.status.state === 'stopped') return;
      this.status.state = 'reconnecting';
      this.status.reconnects++;
      // Back off: double the wait up to the maximum, reset on the next CONNACK.
      this.status.nextRetryMs = Math.min(this.maxMs, waitMs * 2);
      this.options.log.warn({ url: this.status.url, attempt: this.status.reconnects, nextRetryMs: this.status.nextRetryMs }, 'reconnecting to MQTT broker');
      this.open();
    }, waitMs);
  }

  health(): ExternalClientStatus {
    return { ...this.status };
  }

  get connected(): boolean {
    return this.status.state === 'connected';
  }

  async stop(): Promise<void> {
    this.status.state = 'stopped';
    if (this.retryTimer) clearTimeout(this.retryTimer);
    this.retryTimer = null;
    this.firstConnect?.reject(new Error('stopped before connecting'));
    this.firstConnect = null;
    const connection = this.connection;
    this.connection = null;
    if (connection) await connection.end(2_000);
  }
}

/** The user name and password: from the options, else from the URL's user info. */
function credentialsOf(o: ExternalClientOptions): { username: string | null; password: string | null } {
  let fromUrl: URL | null = null;
  try {
    fromUrl = new URL(o.url);
  } catch {
    fromUrl = null;
  }
  const decode = (s: string | undefined): string | null => {
    if (!s) return null;
    try {
      return decodeURIComponent(s);
    } catch {
      return s; // not percent-encoded after all (config.ts warns of this at start)
    }
  };
  return {
    username: o.username ?? decode(fromUrl?.username),
    password: o.password ?? decode(fromUrl?.password),
  };
}

function openStream(o: ExternalClientOptions): Duplex {
  const url = new URL(o.url);
  const tlsFiles = {
    ...(o.caFile ? { ca: fs.readFileSync(o.caFile) } : {}),
    ...(o.certFile ? { cert: fs.readFileSync(o.certFile) } : {}),
    ...(o.keyFile ? { key: fs.readFileSync(o.keyFile) } : {}),
  };
  const host = url.hostname.replace(/^\[|\]$/g, '');
  const port = (fallback: number): number => (url.port ? Number(url.port) : fallback);
  switch (url.protocol) {
    case 'mqtt:':
    case 'tcp:': {
      const socket = net.connect({ host, port: port(1883) });
      socket.setNoDelay(true);
      return socket;
    }
    case 'mqtts:':
    case 'ssl:':
    case 'tls:': {
      const socket = tls.connect({ host, port: port(8883), ...(net.isIP(host) ? {} : { servername: host }), ...tlsFiles });
      socket.setNoDelay(true);
      return socket;
    }
    case 'ws:':
    case 'wss:': {
      const ws = new WebSocket(url, ['mqtt'], tlsFiles);
      return createWebSocketStream(ws);
    }
    default:
      throw new Error(`MQTT_URL scheme "${url.protocol}" is not one of mqtt:, mqtts:, ws:, wss:`);
  }
}

function sleep(ms: number): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, ms).unref());
}

/** The URL without a password, for logs and health. */
export function redactUrl(url: string): string {
  try {
    const u = new URL(url);
    if (u.password) u.password = '***';
    return u.toString();
  } catch {
    return url.replace(/\/\/[^@/]*@/, '//***@');
  }
}
