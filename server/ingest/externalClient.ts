/**
 * Ingest from an external broker (MQTT_URL): one persistent-session subscriber at QoS 1.
 *
 * mqtt.js sends the PUBACK for a QoS 1 message only when `handleMessage`'s callback is called,
 * so the callback waits for the commit; a failed commit withholds it and the broker delivers
 * the message again after reconnecting (readings are de-duplicated on sensor and time). The
 * handler is set synchronously after `connect()`, before CONNACK, because a broker resends
 * in-flight messages at once and mqtt.js's default handler would acknowledge them unstored.
 * Reconnects back off from 1 s to 30 s and are reported in /api/health and the log.
 */
import fs from 'node:fs';
import mqtt, { type IClientOptions, type MqttClient } from 'mqtt';
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
}

export interface ExternalClientStatus {
  kind: 'external';
  url: string;
  state: 'connecting' | 'connected' | 'reconnecting' | 'offline' | 'stopped';
  sinceMs: number;
  reconnects: number;
  nextRetryMs: number;
  lastError: string | null;
}

/** One week: the broker keeps our session and queued messages through a long outage. */
const sessionExpirySeconds = 7 * 24 * 3600;

export class ExternalClient {
  private client: MqttClient | null = null;
  private readonly status: ExternalClientStatus;

  constructor(private readonly options: ExternalClientOptions) {
    this.status = {
      kind: 'external',
      url: redactUrl(options.url),
      state: 'connecting',
      sinceMs: (options.now ?? Date.now)(),
      reconnects: 0,
      nextRetryMs: options.minReconnectMs ?? 1_000,
      lastError: null,
    };
  }

  /**
   * Starts connecting and resolves on the first CONNACK. The server does not wait for it: a
   * broker that is down at start is retried with back-off like any later outage.
   */
  start(): Promise<void> {
    const o = this.options;
    const now = o.now ?? Date.now;
    const minMs = o.minReconnectMs ?? 1_000;
    const maxMs = o.maxReconnectMs ?? 30_000;
    const connectOptions: IClientOptions = {
      clientId: o.clientId,
      clean: false,
      protocolVersion: o.protocolVersion,
      reconnectPeriod: minMs,
      connectTimeout: 10_000,
      keepalive: 30,
      resubscribe: true,
      ...(o.protocolVersion === 5 ? { properties: { sessionExpiryInterval: sessionExpirySeconds } } : {}),
      ...(o.username !== null ? { username: o.username } : {}),
      ...(o.password !== null ? { password: o.password } : {}),
      ...(o.caFile ? { ca: fs.readFileSync(o.caFile) } : {}),
      ...(o.certFile ? { cert: fs.readFileSync(o.certFile) } : {}),
      ...(o.keyFile ? { key: fs.readFileSync(o.keyFile) } : {}),
    };
    const client = mqtt.connect(o.url, connectOptions);
    client.handleMessage = (packet, done) => {
      const payload = typeof packet.payload === 'string' ? Buffer.from(packet.payload) : packet.payload;
      o.sink.accept(packet.topic, payload, now()).then(
        () => done(),
        (err: unknown) => {
          o.log.error({ err: String(err), topic: packet.topic }, 'reading not committed; left unacknowledged for redelivery');
          // Withholding the ack is only effective if the connection drops: the broker resends
          // unacknowledged messages on reconnect. Drop it so the message comes back.
          done(err instanceof Error ? err : new Error(String(err)));
          client.stream.destroy();
        },
      );
    };
    this.client = client;

    return new Promise<void>((resolve, reject) => {
      let first = true;
      client.on('connect', (connack) => {
        this.status.state = 'connected';
        this.status.sinceMs = now();
        this.status.nextRetryMs = minMs;
        client.options.reconnectPeriod = minMs;
        o.log.info({ url: this.status.url, sessionPresent: connack.sessionPresent }, 'connected to MQTT broker');
        // Subscribing again on a present session is harmless and covers a lost subscription.
        client.subscribe(readingTopicFilter(o.topicPrefix), { qos: 1 }, (err) => {
          if (err) o.log.error({ err: String(err) }, 'could not subscribe to reading topics');
        });
        if (first) {
          first = false;
          resolve();
        }
      });
      client.on('reconnect', () => {
        this.status.state = 'reconnecting';
        this.status.reconnects++;
        // Back off: double the wait up to the maximum, reset on the next CONNACK.
        const next = Math.min(maxMs, this.status.nextRetryMs * 2);
        this.status.nextRetryMs = next;
        client.options.reconnectPeriod = next;
        o.log.warn({ url: this.status.url, attempt: this.status.reconnects, nextRetryMs: next }, 'reconnecting to MQTT broker');
      });
      client.on('offline', () => {
        if (this.status.state !== 'stopped') {
          this.status.state = 'offline';
          this.status.sinceMs = now();
          o.log.warn({ url: this.status.url }, 'MQTT broker connection lost');
        }
      });
      client.on('error', (err) => {
        this.status.lastError = err.message;
        o.log.error({ url: this.status.url, err: err.message }, 'MQTT client error');
      });
      client.on('close', () => {
        if (first && this.status.state === 'stopped') reject(new Error('stopped before connecting'));
      });
    });
  }

  health(): ExternalClientStatus {
    return { ...this.status };
  }

  get connected(): boolean {
    return this.status.state === 'connected';
  }

  async stop(): Promise<void> {
    this.status.state = 'stopped';
    const client = this.client;
    this.client = null;
    if (client) await client.endAsync();
  }
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
