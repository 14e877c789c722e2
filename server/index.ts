import { env } from './config/env.js';
import { createDatabase } from './db/client.js';
import { runMigrations } from './db/migrate.js';
import { createApp } from './app.js';
import { logger } from './lib/logger.js';
import { warmTileConnections } from './modules/home-tiles/home-tiles.service.js';
import { createObjectStorage, ensureBucketAtStart } from './lib/object-storage.js';

const config = env();
const database = createDatabase(config.DATABASE_URL);
await runMigrations(database);
const storage = createObjectStorage(config);
const app = createApp({ env: config, database, storage });
const server = app.listen(config.PORT, config.HOST, () => {
  const url = `http://localhost:${config.PORT}`;
  process.stdout.write(`\nTractwise is running at ${url}\n`);
  process.stdout.write(`Demo sign-ins (password demo-pass-2026): admin@tarrowby-radon.test, manager@…, estimator@…, technician@…, sales@… (README.md)\n\n`);
  logger.info('listening', { host: config.HOST, port: config.PORT });
});
// In the background: the store (or the local fake started beside this process) may still be starting.
void ensureBucketAtStart(storage);
// In the background too: each map-tile connection does its first, slow query before a map needs it.
void warmTileConnections(database.tiles, database.tileConnections).catch((err: unknown) => logger.warn('tile connections not warmed', { err: String(err) }));

function shutdown(signal: string) {
  logger.info('shutting down', { signal });
  server.close(() => void database.close().then(() => process.exit(0)));
  setTimeout(() => process.exit(0), 3000).unref();
}
process.on('SIGINT', () => shutdown('SIGINT'));
process.on('SIGTERM', () => shutdown('SIGTERM'));
