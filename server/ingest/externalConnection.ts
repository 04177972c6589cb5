/**
 * One network connection to the external broker, from open to close (ingest/externalClient.ts
 * owns the reconnecting and the status): CONNECT with a persistent session, SUBSCRIBE to the
 * reading topics at QoS 1, keep-alive, and the acknowledgements. Every PUBLISH of one socket read
 * is handed to the sink in the same turn, so the write queue commits them together; their PUBACKs
 * (PUBREC, and PUBCOMP for a PUBREL) go out after that commit, chunk after chunk, in the order the
 * packets came (MQTT 3.1.1 section 4.6, MQTT 5.0 section 4.6). A message whose handling fails is
 * never acknowledged: the connection is dropped so the broker delivers it again.
 */
import type { Duplex } from 'node:stream';
import * as mqttPacket from 'mqtt-packet';
import type { ExternalClientOptions } from './externalClient.ts';
import { readingTopicFilter } from './topic.ts';

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
export type ConnectionSettings = ExternalClientOptions & { keepaliveS: number; connectTimeoutMs: number };

/** What a connection tells the client that opened it. */
export interface ConnectionOwner {
  /** The broker accepted the connection (CONNACK with success). */
  connackReceived(sessionPresent: boolean): void;
  /** The broker refused the subscription to the reading topics (SUBACK with a failure code). */
  subscribeRefused(granted: unknown[]): void;
  /** The connection failed for `reason`; it closes next. */
  connectionError(connection: Connection, reason: string): void;
  /** The connection is closed (after a failure, or by the broker). */
  connectionClosed(connection: Connection): void;
}

export class Connection {
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
    private readonly client: ConnectionOwner,
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

function sleep(ms: number): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, ms).unref());
}
