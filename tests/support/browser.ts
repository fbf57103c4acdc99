import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';
import { chromium, type Browser } from 'playwright-core';
import { loadConfig } from '../../server/config';
import { startServices, type Services } from '../../server/bootstrap';

const root = path.resolve(import.meta.dirname, '..', '..');

/** Builds the client once if it is missing or stale, the same way `npm start` does. */
export function buildClientIfNeeded(): void {
  execFileSync(process.execPath, [path.join(root, 'scripts', 'build-if-needed.mjs')], { cwd: root, stdio: 'inherit' });
}

export interface RunningApp {
  baseUrl: string;
  services: Services;
  dataDir: string;
  stop(): Promise<void>;
}

/** The real server on a free port with a fresh SQLite file and the demo data. */
export async function startRunningApp(): Promise<RunningApp> {
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-e2e-'));
  const config = {
    ...loadConfig({ NODE_ENV: 'test', DATA_DIR: dataDir, UPLOADS_DIR: path.join(dataDir, 'uploads') }),
    bcryptRounds: 4,
  };
  const services = await startServices(config, { clientDir: path.join(root, 'dist', 'client'), log: () => {} });
  const server: Server = await new Promise((resolve) => {
    const s = services.app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const { port } = server.address() as AddressInfo;
  return {
    baseUrl: `http://127.0.0.1:${port}`,
    services,
    dataDir,
    async stop() {
      await new Promise((r) => server.close(r));
      await services.shutdown();
      fs.rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

/** Debian's Chromium, driven by playwright-core (no browser download). */
export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: ['--no-sandbox', '--disable-gpu', '--disable-dev-shm-usage'],
  });
}
