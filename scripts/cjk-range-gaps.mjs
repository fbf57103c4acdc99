// Writes server/modules/calc-sheets/cjk-range-gaps.json: for each CJK @fontsource package the
// sheet inlines, the code points its numbered subsets' unicode-ranges (unicode.json) name but
// whose font file has no glyph for them, in weight 400 or 700. Read from the font files' own
// character maps by fontconfig's fc-query. The sheet leaves these out of a face's range, so a
// character goes to a face that really holds it (sheet-assets.ts, CJK_FACES).
// Run after upgrading the packages: node scripts/cjk-range-gaps.mjs   (needs fc-query)
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const PACKAGES = ['noto-sans-sc', 'noto-sans-jp', 'noto-sans-tc', 'noto-sans-kr'];
const WEIGHTS = [400, 700];

function charset(file) {
  const out = execFileSync('fc-query', ['-f', '%{charset}', file], { encoding: 'utf8' });
  const s = new Set();
  for (const part of out.trim().split(/\s+/).filter(Boolean)) {
    const [lo, hi] = part.split('-').map((h) => parseInt(h, 16));
    for (let c = lo; c <= (hi ?? lo); c++) s.add(c);
  }
  return s;
}

function parseRange(range) {
  return range.split(',').map((part) => {
    const m = /U\+([0-9A-F?]+)(?:-([0-9A-F]+))?/i.exec(part.trim());
    if (m[1].includes('?')) return [parseInt(m[1].replace(/\?/g, '0'), 16), parseInt(m[1].replace(/\?/g, 'F'), 16)];
    const lo = parseInt(m[1], 16);
    return [lo, m[2] ? parseInt(m[2], 16) : lo];
  });
}

const hex = (n) => n.toString(16).toUpperCase();
const out = {};
for (const pkg of PACKAGES) {
  const dir = path.join(ROOT, 'node_modules', '@fontsource', pkg);
  const ranges = JSON.parse(fs.readFileSync(path.join(dir, 'unicode.json'), 'utf8'));
  const gaps = new Set();
  for (const [key, range] of Object.entries(ranges)) {
    const m = /^\[(\d+)\]$/.exec(key);
    if (!m) continue;
    for (const weight of WEIGHTS) {
      const held = charset(path.join(dir, 'files', `${pkg}-${m[1]}-${weight}-normal.woff2`));
      for (const [lo, hi] of parseRange(range)) for (let c = lo; c <= hi; c++) if (!held.has(c)) gaps.add(c);
    }
  }
  const sorted = [...gaps].sort((a, b) => a - b);
  const parts = [];
  for (const c of sorted) {
    const last = parts[parts.length - 1];
    if (last && last[1] === c - 1) last[1] = c;
    else parts.push([c, c]);
  }
  const version = JSON.parse(fs.readFileSync(path.join(dir, 'package.json'), 'utf8')).version;
  out[pkg] = { version, gaps: parts.map(([lo, hi]) => (lo === hi ? `U+${hex(lo)}` : `U+${hex(lo)}-${hex(hi)}`)).join(',') };
  console.log(`${pkg} ${version}: ${sorted.length} code points named without a glyph`);
}
fs.writeFileSync(path.join(ROOT, 'server', 'modules', 'calc-sheets', 'cjk-range-gaps.json'), `${JSON.stringify(out, null, 1)}\n`);
