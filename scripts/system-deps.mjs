#!/usr/bin/env node
// Makes sure the Debian packages Panelpoint needs are present: Chromium (calc-sheet PDFs and
// browser tests) and poppler-utils (PDF checks in the tests). Installs them when missing and
// running as root; otherwise stops with one line saying what to run.
import { execFileSync, spawnSync } from 'node:child_process';
import fs from 'node:fs';

const purpose = (process.argv.find((a) => a.startsWith('--for=')) ?? '--for=start').slice(6);
const chromium = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';

const wanted = [{ pkg: 'chromium', present: () => fs.existsSync(chromium) }];
if (purpose === 'test') wanted.push({ pkg: 'poppler-utils', present: () => onPath('pdftotext') });

function onPath(cmd) {
  return spawnSync('sh', ['-c', `command -v ${cmd}`], { stdio: 'ignore' }).status === 0;
}

const missing = wanted.filter((w) => !w.present()).map((w) => w.pkg);
if (missing.length === 0) process.exit(0);

const command = `apt-get update && apt-get install -y --no-install-recommends ${missing.join(' ')}`;
const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;
if (!isRoot || !onPath('apt-get')) {
  console.error(`Panelpoint needs ${missing.join(' and ')} from Debian: run as root \`${command}\`, then try again.`);
  process.exit(1);
}
console.log(`Installing ${missing.join(', ')} from Debian (one time, about a minute)…`);
try {
  execFileSync('sh', ['-c', `apt-get update -qq && DEBIAN_FRONTEND=noninteractive apt-get install -y -qq --no-install-recommends ${missing.join(' ')} > /dev/null`], {
    stdio: 'inherit',
  });
} catch {
  console.error(`Installing ${missing.join(' and ')} failed: run \`${command}\` by hand and try again.`);
  process.exit(1);
}
