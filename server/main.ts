/**
 * `npm start` (and `npm run demo`): reads the configuration, starts the server, and stops it
 * cleanly on SIGINT/SIGTERM. Startup problems (a port in use, a bad setting) end the process
 * with one plain message naming the setting to change.
 */
// First the garbage collector's settings; the rest is imported once they are set, since loading
// the modules already grows the young generation (static imports all load before any runs).
import './heapSettings.ts';

async function main(): Promise<void> {
  const { ConfigError, configFromEnv } = await import('./config.ts');
  const { PortInUseError } = await import('./ingest/embeddedBroker.ts');
  const { createLogger } = await import('./log.ts');
  const { startServer } = await import('./runtime.ts');
  let config;
  try {
    config = configFromEnv(process.env, process.argv.slice(2));
  } catch (err) {
    console.error(`holdfast: ${err instanceof ConfigError ? err.message : String(err)}`);
    process.exit(2);
  }
  const log = createLogger(config.logLevel);
  try {
    // The demo's simulated anemometers (and the MQTT client they publish with) load only for --demo.
    const server = config.demo ? await (await import('./demo/demo.ts')).runDemo(config, log) : await startServer(config, log);
    let stopping = false;
    const stop = (signal: string) => {
      if (stopping) return;
      stopping = true;
      log.info({ signal }, 'stopping');
      server.close().then(
        () => process.exit(0),
        (err: unknown) => {
          log.error({ err: String(err) }, 'error while stopping');
          process.exit(1);
        },
      );
    };
    process.on('SIGINT', () => stop('SIGINT'));
    process.on('SIGTERM', () => stop('SIGTERM'));
  } catch (err) {
    if (err instanceof PortInUseError) log.fatal(err.message);
    else log.fatal({ err: err instanceof Error ? { message: err.message, stack: err.stack } : String(err) }, 'could not start');
    // Give pino a moment to write the line before exiting.
    setTimeout(() => process.exit(1), 100);
  }
}

void main();
