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
 *
 * This file is the client: its options, its status and the reconnecting. One connection's packets
 * and acks are ingest/externalConnection.ts; the transports and credentials ingest/externalTransport.ts.
 */
import type { Duplex } from 'node:stream';
import type { Logger } from '../log.ts';
import { Connection, type ConnectionOwner } from './externalConnection.ts';
import { credentialsOf, openStream, redactUrl } from './externalTransport.ts';
import type { ReadingSink } from './sink.ts';

export { redactUrl } from './externalTransport.ts';

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

export class ExternalClient implements ConnectionOwner {
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
