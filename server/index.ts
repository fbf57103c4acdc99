import http from 'node:http';
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
  // Express 5's app.listen hands a listen error to its callback as an argument: a taken port
  // printed "is running" and left a server that served nothing. The error is taken here
  // instead, and stops the start with one sentence naming PORT once the services are closed.
  const server = http.createServer(services.app);
  try {
    await new Promise<void>((resolve, reject) => {
      server.once('error', reject);
      server.listen(config.port, () => {
        server.off('error', reject);
        resolve();
      });
    });
  } catch (err) {
    await services.shutdown().catch(() => {});
    throw new Error(listenRefusal(err, config.port));
  }
  console.log(`Panelpoint is running on http://localhost:${config.port}`);
  if (services.sink) console.log(`Local mail sink on 127.0.0.1:${services.sink.port}; admins read it at /admin/outbox`);
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

/** The one sentence a failed listen stops with. */
function listenRefusal(err: unknown, port: number): string {
  const code = (err as NodeJS.ErrnoException).code;
  if (code === 'EADDRINUSE') return `Configuration: PORT ${port} is already in use by another program (perhaps another Panelpoint); stop it or give this process another PORT.`;
  if (code === 'EACCES') return `Configuration: PORT ${port} may not be opened by this user (ports below 1024 need extra rights); use a port of 1024 or above behind a reverse proxy.`;
  return `Configuration: could not listen on PORT ${port}: ${err instanceof Error ? err.message : String(err)}.`;
}

main().catch((err) => {
  console.error(`Panelpoint could not start: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
