#!/usr/bin/env node
// Builds the client when dist/client is missing or older than any client source, so
// `npm start` serves what is in the tree without a slow build on every start.
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';

const root = path.resolve(path.dirname(new URL(import.meta.url).pathname), '..');
const built = path.join(root, 'dist', 'client', 'index.html');
const sources = ['src', 'shared', 'index.html', 'vite.config.ts', 'tailwind.config.ts', 'package-lock.json'];

function newest(p) {
  const full = path.join(root, p);
  if (!fs.existsSync(full)) return 0;
  const stat = fs.statSync(full);
  if (!stat.isDirectory()) return stat.mtimeMs;
  let max = stat.mtimeMs;
  for (const entry of fs.readdirSync(full)) max = Math.max(max, newest(path.join(p, entry)));
  return max;
}

const builtAt = fs.existsSync(built) ? fs.statSync(built).mtimeMs : 0;
if (builtAt > Math.max(...sources.map(newest))) process.exit(0);
console.log('Building the client…');
execFileSync(process.execPath, [path.join(root, 'node_modules', 'vite', 'bin', 'vite.js'), 'build', '--logLevel', 'error'], {
  cwd: root,
  stdio: 'inherit',
});
