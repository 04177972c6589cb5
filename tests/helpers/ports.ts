/** Loopback ports for tests that start brokers and servers of their own. */
import net from 'node:net';
import { waitFor } from './testServer.ts';

/** A port nothing listens on right now, on 127.0.0.1. */
export function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = net.createServer().listen(0, '127.0.0.1', () => {
      const port = (s.address() as net.AddressInfo).port;
      s.close(() => resolve(port));
    });
  });
}

/** Waits until something accepts connections on 127.0.0.1:`port`. */
export async function waitForListener(port: number, what: string, timeoutMs = 5_000): Promise<void> {
  await waitFor(
    () =>
      new Promise<boolean>((resolve) => {
        const s = net.connect(port, '127.0.0.1', () => {
          s.end();
          resolve(true);
        });
        s.on('error', () => resolve(false));
      }),
    timeoutMs,
    what,
  );
}
