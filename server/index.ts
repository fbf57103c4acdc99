import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadConfig } from './config';
import { startServices } from './bootstrap';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

async function main() {
  // Anything the server or its children (SQLite, Chromium) create is private to this user,
  // besides the explicit 0600/0700 modes on the files Panelpoint writes itself.
  process.umask(0o077);
  const config = loadConfig();
  const services = await startServices(config, { clientDir: path.join(root, 'dist', 'client') });
  const server = services.app.listen(config.port, () => {
    console.log(`Panelpoint is running on http://localhost:${config.port}`);
    if (services.sink) console.log(`Local mail sink on 127.0.0.1:${services.sink.port}; admins read it at /admin/outbox`);
  });
  let closing = false;
  const stop = async () => {
    if (closing) return;
    closing = true;
    server.close();
    await services.shutdown();
    process.exit(0);
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((err) => {
  console.error(`Panelpoint could not start: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
