// Top self-time functions of a V8 .cpuprofile (node --cpu-prof), and the same summed by file.
// Usage: node bench/cpu-profile-top.mjs FILE.cpuprofile [count]   (default 30)
import fs from 'node:fs';

const [file, countArg] = process.argv.slice(2);
if (!file) {
  console.error('Usage: node bench/cpu-profile-top.mjs FILE.cpuprofile [count]');
  process.exit(2);
}
const count = Number(countArg ?? 30);
const profile = JSON.parse(fs.readFileSync(file, 'utf8'));
const byId = new Map(profile.nodes.map((n) => [n.id, n]));
// timeDeltas[i] is the time before samples[i] was taken, in microseconds.
const selfUs = new Map();
for (let i = 0; i < profile.samples.length; i++) {
  const id = profile.samples[i];
  selfUs.set(id, (selfUs.get(id) ?? 0) + (profile.timeDeltas[i] ?? 0));
}
const total = [...selfUs.values()].reduce((a, b) => a + b, 0);
const byFunction = new Map();
const byFile = new Map();
for (const [id, us] of selfUs) {
  const f = byId.get(id).callFrame;
  const where = f.url ? f.url.replace(/^file:\/\//, '').replace(/.*node_modules\//, 'nm/').replace(process.cwd() + '/', '') : '';
  const key = `${f.functionName || '(anonymous)'}  ${where}${f.url ? `:${f.lineNumber + 1}` : ''}`;
  byFunction.set(key, (byFunction.get(key) ?? 0) + us);
  const fileKey = where || f.functionName;
  byFile.set(fileKey, (byFile.get(fileKey) ?? 0) + us);
}
const print = (title, map) => {
  console.log(`\n${title} (total ${(total / 1000).toFixed(0)} ms sampled)`);
  for (const [k, us] of [...map.entries()].sort((a, b) => b[1] - a[1]).slice(0, count)) {
    console.log(`${(us / 1000).toFixed(1).padStart(9)} ms ${((100 * us) / total).toFixed(1).padStart(5)} %  ${k}`);
  }
};
// Total (inclusive) time: a function counts once per sample in whose stack it appears.
const parent = new Map();
for (const n of profile.nodes) for (const c of n.children ?? []) parent.set(c, n.id);
const keyOf = (n) => {
  const f = n.callFrame;
  const where = f.url ? f.url.replace(/^file:\/\//, '').replace(/.*node_modules\//, 'nm/').replace(process.cwd() + '/', '') : '';
  return `${f.functionName || '(anonymous)'}  ${where}${f.url ? `:${f.lineNumber + 1}` : ''}`;
};
const totalUs = new Map();
for (const [id, us] of selfUs) {
  const seen = new Set();
  for (let at = id; at !== undefined; at = parent.get(at)) {
    const k = keyOf(byId.get(at));
    if (seen.has(k)) continue;
    seen.add(k);
    totalUs.set(k, (totalUs.get(k) ?? 0) + us);
  }
}
print('self time by function', byFunction);
print('total time by function (self and callees)', new Map([...totalUs].filter(([k]) => !k.startsWith('(root)'))));
print('self time by file', byFile);
