/**
 * The transport under the external-broker connection: a byte stream for MQTT_URL (mqtt:// TCP,
 * mqtts:// TLS with MQTT_CA_FILE / MQTT_CERT_FILE / MQTT_KEY_FILE, ws:// and wss:// WebSocket with
 * subprotocol "mqtt" via the ws package), the credentials from the options or the URL's user
 * info, and the URL without its password for logs and health.
 */
import fs from 'node:fs';
import net from 'node:net';
import tls from 'node:tls';
import type { Duplex } from 'node:stream';
import WebSocket, { createWebSocketStream } from 'ws';
import type { ExternalClientOptions } from './externalClient.ts';

/** The user name and password: from the options, else from the URL's user info. */
export function credentialsOf(o: ExternalClientOptions): { username: string | null; password: string | null } {
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

export function openStream(o: ExternalClientOptions): Duplex {
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
