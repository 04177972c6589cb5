/**
 * The external broker's baseline, run as a child process like the server: a bare mqtt.js
 * subscriber that only counts, subscribed the way the server's ingest client is (persistent
 * session: `clean: false`, a fixed client id, MQTT 5 with a session expiry, QoS 1). mqtt.js
 * acknowledges each message as soon as its handler returns.
 */
import mqtt from 'mqtt';
import { wallMs } from './common.ts';

export type SubscriberCommand = { cmd: 'start'; url: string; clientId: string; topicFilter: string } | { cmd: 'expect'; count: number } | { cmd: 'close' };

export type SubscriberReply = { kind: 'subscribed' } | { kind: 'counted'; count: number; firstAtMs: number; lastAtMs: number } | { kind: 'error'; message: string };

let counted = 0;
let firstAtMs = 0;
let expected = Number.POSITIVE_INFINITY;
let reported = false;
let client: mqtt.MqttClient | null = null;

function start(url: string, clientId: string, topicFilter: string): void {
  client = mqtt.connect(url, { clientId, clean: false, protocolVersion: 5, properties: { sessionExpiryInterval: 3600 }, reconnectPeriod: 1_000 });
  client.on('message', () => {
    if (counted === 0) firstAtMs = wallMs();
    counted++;
    if (!reported && counted >= expected) {
      reported = true;
      process.send?.({ kind: 'counted', count: counted, firstAtMs, lastAtMs: wallMs() } satisfies SubscriberReply);
    }
  });
  client.once('connect', () => {
    client!.subscribe(topicFilter, { qos: 1 }, (err) => {
      process.send?.((err ? { kind: 'error', message: err.message } : { kind: 'subscribed' }) satisfies SubscriberReply);
    });
  });
}

process.on('message', (message: SubscriberCommand) => {
  switch (message.cmd) {
    case 'start':
      start(message.url, message.clientId, message.topicFilter);
      return;
    case 'expect':
      counted = 0;
      reported = false;
      expected = message.count;
      return;
    case 'close':
      void (client?.endAsync(true) ?? Promise.resolve()).finally(() => process.exit(0));
  }
});
process.on('disconnect', () => process.exit(0));
