import type { Server } from 'node:http';
import { createApp } from './app.ts';
import { ConfigError, parseConfig } from './config.ts';
import { createServices } from './services.ts';

/** Start the API on its own (production); `npm start` uses scripts/start.ts, which also runs the fakes. */
async function main() {
  let config;
  try {
    config = parseConfig();
  } catch (err) {
    if (err instanceof ConfigError) {
      console.error(err.message);
      process.exit(1);
    }
    throw err;
  }
  const services = await createServices(config);
  const app = createApp(config, services);
  const server: Server = app.listen(config.port, config.host, () => {
    services.logger.info(`Underfoot listening on ${config.publicUrl}`);
  });
  const stop = () => {
    server.close(() => void services.close().then(() => process.exit(0)));
  };
  process.on('SIGTERM', stop);
  process.on('SIGINT', stop);
}

void main();
