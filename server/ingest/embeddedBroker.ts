/**
 * The embedded MQTT broker (aedes, MQTT 3.1.1), on by default so that a fresh machine needs
 * nothing installed. Only registered gateways may connect, each with its own username and
 * password, and each may publish only to the reading topics of its own sensors; every refusal is
 * logged and counted, and recorded with who, when, which topic and why for the Sensors screen
 * (`BrokerRefusals`, memory only). Subscriptions are refused: gateways publish, nobody listens here.
 *
 * Readings are taken in aedes's `authorizePublish` hook, which runs before the broker sends the
 * gateway its PUBACK: the hook calls back only after the reading is committed, so a QoS 1
 * publish acknowledged to a gateway is on disk (design.md 5). aedes hands all packets of one
 * socket read to the hooks concurrently, which lets the write queue commit them together.
 */
import { createHash } from 'node:crypto';
import { createServer, type Server, type Socket } from 'node:net';
import { Aedes, type Client } from 'aedes';
import * as mqttPacket from 'mqtt-packet';
import type { Logger } from '../log.ts';
import { verifyPassword } from '../auth/password.ts';
import { SignInLimiter, type SignInLimiterOptions } from '../auth/signInLimiter.ts';
import type { Registry, RegisteredGateway } from './registry.ts';
import type { BrokerRefusals, RefusalInput, RefusalReason } from './rejections.ts';
import type { ReadingSink } from './sink.ts';
import { sensorKeyOfTopic } from './topic.ts';

/** aedes's CONNACK return codes (its `AuthErrorCode` is a const enum, not importable at run time). */
const returnCodeBadCredentials = 4;
const returnCodeNotAuthorized = 5;
/** CONNACK 2: identifier rejected (MQTT 3.1.1 §3.2.2.3). */
const returnCodeIdentifierRejected = 2;

export interface EmbeddedBrokerOptions {
  host: string;
  port: number;
  topicPrefix: string;
  registry: Registry;
  sink: ReadingSink;
  log: Logger;
  now?: () => number;
  /** Where refusals are recorded for the Sensors screen (who, when, topic, reason). */
  refusals?: BrokerRefusals;
  /** Failed CONNECTs per username and per address (defaults: 10 and 30 in 15 minutes). */
  signInLimits?: { perUsername: SignInLimiterOptions; perAddress: SignInLimiterOptions };
}

/**
 * MQTT sign-in limits, as for the web (server/auth/signInLimiter.ts): a username is locked after
 * 10 failed CONNECTs in 15 minutes, an address after 30 (a site's gateways may share one uplink).
 * While locked a CONNECT is refused before any password derivation, so a flood costs nothing but
 * the refusal. A gateway reconnecting with the password already checked passes without the
 * limiter (the cache below), so a flood aimed at a real gateway's username cannot keep it off.
 */
export const defaultBrokerSignInLimits = {
  perUsername: { maxFailures: 10, windowMs: 15 * 60_000 },
  perAddress: { maxFailures: 30, windowMs: 15 * 60_000 },
} as const;

/** Socket errors that are a client going away, not the broker refusing it. */
const goneCodes = new Set(['ECONNRESET', 'EPIPE', 'ECONNABORTED', 'ETIMEDOUT']);

export interface BrokerStatus {
  kind: 'embedded';
  listening: boolean;
  host: string;
  port: number;
  connectedGateways: number;
  refusedConnections: number;
  refusedPublishes: number;
  /** Refused publishes acknowledged and dropped (the connection kept): a topic the gateway may not use. */
  droppedPublishes: number;
}

export class PortInUseError extends Error {}

export class EmbeddedBroker {
  private aedes: Aedes | null = null;
  private server: Server | null = null;
  private readonly gatewayOfClient = new WeakMap<Client, RegisteredGateway>();
  /** Passwords already checked, as SHA-256 digests, per username and stored hash (memory only). */
  private readonly verified = new Map<string, { passwordHash: string; digest: string }>();
  private readonly status: BrokerStatus;
  /** Each connection's address, taken when it arrives (a destroyed socket no longer has one). */
  private readonly addressOf = new WeakMap<object, string>();

  private readonly usernameLimiter: SignInLimiter;
  private readonly addressLimiter: SignInLimiter;

  constructor(private readonly options: EmbeddedBrokerOptions) {
    const limits = options.signInLimits ?? defaultBrokerSignInLimits;
    this.usernameLimiter = new SignInLimiter(limits.perUsername);
    this.addressLimiter = new SignInLimiter(limits.perAddress);
    this.status = {
      kind: 'embedded',
      listening: false,
      host: options.host,
      port: options.port,
      connectedGateways: 0,
      refusedConnections: 0,
      refusedPublishes: 0,
      droppedPublishes: 0,
    };
  }

  async start(): Promise<void> {
    const { registry, sink, log, topicPrefix } = this.options;
    // aedes writes packets with mqtt-packet, which by default builds a cache of one 2-byte Buffer
    // for every packet id (65,536 Buffers: 6.5 MB of the server's heap, seen in a heap snapshot
    // under `npm run bench`) the first time it writes one. Off, the two bytes are made per packet:
    // the switch mqtt-packet documents for this (writeToStream.js, `cacheNumbers`), and the one
    // mqtt.js sets with its `writeCache: false` option.
    mqttPacket.writeToStream.cacheNumbers = false;
    const now = this.options.now ?? Date.now;
    const addressOfClient = (client: Client | null | undefined): string | null => (client ? (this.addressOf.get(client.conn) ?? (client.conn as Partial<Socket>).remoteAddress ?? null) : null);
    const record = (entry: RefusalInput): void => this.options.refusals?.record(entry);
    const aedes = await Aedes.createBroker({
      authenticate: (client, username, password, done) => {
        const refuse = (why: string, code: number, reason: RefusalReason, detail: string): void => {
          this.status.refusedConnections++;
          log.warn({ clientId: client.id, username, why }, 'MQTT connection refused');
          record({ kind: 'connect', reason, detail, clientId: client.id ?? null, username: username ?? null, address: addressOfClient(client), topic: null });
          done(Object.assign(new Error(why), { returnCode: code }) as never, false);
        };
        const gateway = username === undefined ? undefined : registry.gatewayByUsername(username);
        if (username === undefined) return refuse('unknown gateway or no password', returnCodeBadCredentials, 'no-username', 'connected without a username; every gateway signs in with its own');
        if (!gateway) return refuse('unknown gateway or no password', returnCodeBadCredentials, 'unknown-username', `no gateway has the username "${username}" (or it was revoked)`);
        if (password === undefined) return refuse('unknown gateway or no password', returnCodeBadCredentials, 'no-password', `gateway "${username}" connected without a password`);
        // A gateway reconnecting with the password it used before is not hashed again: scrypt
        // costs about 140 ms (auth/password.ts), and after a site's network blip every gateway reconnects at once.
        const digest = createHash('sha256').update(password).digest('hex');
        // A client id belongs to the gateway using it: another gateway connecting with it would
        // take over the session and knock the first one offline (issue 13 item 5).
        const takenBy = (): string | null => {
          // aedes keeps its live clients by id (aedes.js: `this.clients`), not in its typings.
          const existing = (this.aedes as unknown as { clients?: Record<string, Client> } | null)?.clients?.[client.id];
          const owner = existing && existing !== client ? this.gatewayOfClient.get(existing) : undefined;
          return owner && owner.username !== gateway.username ? owner.username : null;
        };
        const refuseTaken = (owner: string): void =>
          refuse('client id in use by another gateway', returnCodeIdentifierRejected, 'client-id-taken', `client id "${client.id.slice(0, 64)}" is in use by gateway "${owner}"; give each gateway its own client id`);
        const known = this.verified.get(gateway.username);
        if (known && known.passwordHash === gateway.passwordHash && known.digest === digest) {
          const owner = takenBy();
          if (owner !== null) return refuseTaken(owner);
          this.gatewayOfClient.set(client, gateway);
          return done(null, true);
        }
        const at = now();
        const address = addressOfClient(client) ?? 'unknown address';
        const waitMs = Math.max(this.usernameLimiter.retryAfterMs([gateway.username], at), this.addressLimiter.retryAfterMs([address], at));
        if (waitMs > 0) {
          return refuse('too many failed sign-ins', returnCodeNotAuthorized, 'locked', `too many failed sign-ins for gateway "${gateway.username}" or from ${address}: refused without checking for ${Math.ceil(waitMs / 60_000)} min`);
        }
        // Counted as failed before the check (twenty guesses at once must not all pass the count).
        const undoUser = this.usernameLimiter.begin([gateway.username], at);
        const undoAddress = this.addressLimiter.begin([address], at);
        verifyPassword(password.toString('utf8'), gateway.passwordHash, 'broker').then(
          (ok) => {
            // Re-read: the gateway may have been revoked while the hash was being checked.
            const current = registry.gatewayByUsername(gateway.username);
            if (!ok) return refuse('bad credentials', returnCodeBadCredentials, 'wrong-password', `wrong password for gateway "${gateway.username}"`);
            undoUser();
            undoAddress();
            this.usernameLimiter.succeed(gateway.username);
            if (!current) return refuse('bad credentials', returnCodeBadCredentials, 'unknown-username', `gateway "${gateway.username}" was revoked while it signed in`);
            this.verified.set(current.username, { passwordHash: current.passwordHash, digest });
            const owner = takenBy();
            if (owner !== null) return refuseTaken(owner);
            this.gatewayOfClient.set(client, current);
            done(null, true);
          },
          (err: unknown) => refuse(`credential check failed: ${String(err)}`, returnCodeNotAuthorized, 'check-failed', `the password check failed on the server: ${String(err)}`),
        );
      },
      authorizePublish: (client, packet, callback) => {
        if (!client) return callback(null); // the broker's own $SYS messages
        const stored = this.gatewayOfClient.get(client);
        // Look the gateway up again: revoking credentials or changing its sensors takes effect at once.
        const current = stored ? registry.gatewayByUsername(stored.username) : undefined;
        // A new password ends the connections made with the old one (its field's help says the old
        // one stops at once): treated as revoked for this connection.
        const gateway = current && current.passwordHash === stored!.passwordHash ? current : undefined;
        const key = sensorKeyOfTopic(topicPrefix, packet.topic);
        if (!gateway || key === null || !gateway.sensorKeys.has(key)) {
          this.status.refusedPublishes++;
          const detail = `gateway "${stored?.username ?? '?'}" may not publish to "${packet.topic}"`;
          sink.refuse(key ?? '*', 'not-permitted', detail);
          const reason: RefusalReason = !gateway ? 'gateway-revoked' : key === null ? 'not-reading-topic' : registry.sensorByKey(key) ? 'other-sensor' : 'unknown-sensor';
          const words: Record<string, string> = {
            'gateway-revoked': current ? `gateway "${stored?.username ?? '?'}" has a new password since it connected: sign in again with it` : `gateway "${stored?.username ?? '?'}" was revoked after it connected`,
            'not-reading-topic': `"${packet.topic.slice(0, 120)}" is not a reading topic (${topicPrefix}/<sensor key>/reading)`,
            'other-sensor': `sensor "${key}" is not one of gateway "${gateway?.username}"'s sensors`,
            'unknown-sensor': `no sensor is registered with the key "${key}"`,
          };
          const payload = typeof packet.payload === 'string' ? Buffer.from(packet.payload) : packet.payload;
          record({ kind: 'publish', reason, detail: words[reason]!, clientId: client.id ?? null, username: stored?.username ?? null, address: addressOfClient(client), topic: packet.topic, payload });
          // Revoked (or a new password): the connection ends. A topic the gateway may not use is
          // acknowledged and dropped instead (issue 13 item 1): MQTT 3.1.1 has no negative PUBACK,
          // and closing the connection made the gateway resend that same QoS 1 message first on
          // every reconnect, starving every sensor behind it. Nothing can subscribe here
          // (authorizeSubscribe), so a message let through goes nowhere; it is never retained.
          if (!gateway) return callback(new Error(detail));
          packet.retain = false;
          this.status.droppedPublishes++;
          return callback(null);
        }
        const payload = typeof packet.payload === 'string' ? Buffer.from(packet.payload) : packet.payload;
        sink.accept(packet.topic, payload, now()).then(
          () => callback(null),
          (err: unknown) => {
            // Not committed: refuse, so the gateway keeps the message and sends it again.
            log.error({ err: String(err), topic: packet.topic }, 'reading not committed; gateway will resend');
            callback(err instanceof Error ? err : new Error(String(err)));
          },
        );
      },
      authorizeSubscribe: (client, subscription, callback) => {
        log.warn({ clientId: client.id, topic: subscription.topic }, 'MQTT subscription refused');
        record({
          kind: 'subscribe',
          reason: 'subscribe',
          detail: 'subscriptions are refused here: gateways publish, nobody subscribes',
          clientId: client.id ?? null,
          username: this.gatewayOfClient.get(client)?.username ?? null,
          address: addressOfClient(client),
          topic: subscription.topic,
        });
        callback(null, null);
      },
    });
    // Refused before any login: an MQTT version aedes does not speak (it answers MQTT 3.1 and
    // 3.1.1), a malformed packet, no CONNECT in time. Login refusals are recorded above.
    aedes.on('connectionError', (client, err) => {
      const code = (err as NodeJS.ErrnoException).code;
      if (code && goneCodes.has(code)) return;
      // Say what to do, not only what the library said: an MQTT 5 gateway is the usual case.
      const advice = /protocol version/i.test(err.message) ? ' — this broker speaks MQTT 3.1.1 (and 3.1), not MQTT 5: set the gateway to MQTT 3.1.1, or run an external broker (MQTT_URL)' : '';
      record({ kind: 'connect', reason: 'protocol', detail: `refused before signing in: ${err.message}${advice}`, clientId: null, username: null, address: addressOfClient(client), topic: null });
    });
    aedes.on('client', () => this.status.connectedGateways++);
    aedes.on('clientDisconnect', () => this.status.connectedGateways--);
    this.aedes = aedes;

    const server = createServer((socket) => {
      if (socket.remoteAddress) this.addressOf.set(socket, socket.remoteAddress);
      aedes.handle(socket);
    });
    await new Promise<void>((resolve, reject) => {
      server.once('error', (err: NodeJS.ErrnoException) => {
        if (err.code === 'EADDRINUSE') {
          reject(
            new PortInUseError(
              `MQTT port ${this.options.port} is already in use. Set MQTT_PORT to a free port for the embedded broker, ` +
                `or set MQTT_URL to use the broker that is running there (see README, "Sensors and gateways").`,
            ),
          );
        } else reject(err);
      });
      server.listen(this.options.port, this.options.host, () => resolve());
    });
    server.on('error', (err) => log.error({ err: String(err) }, 'embedded broker listener error'));
    this.server = server;
    const address = server.address();
    if (address && typeof address === 'object') this.status.port = address.port;
    this.status.listening = true;
    log.info({ host: this.options.host, port: this.status.port }, 'embedded MQTT broker listening');
  }

  get port(): number {
    return this.status.port;
  }

  health(): BrokerStatus {
    return { ...this.status };
  }

  async stop(): Promise<void> {
    this.status.listening = false;
    const server = this.server;
    const aedes = this.aedes;
    this.server = null;
    this.aedes = null;
    if (aedes) await new Promise<void>((resolve) => aedes.close(() => resolve()));
    if (server) await new Promise<void>((resolve) => server.close(() => resolve()));
  }
}
