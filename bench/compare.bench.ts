/**
 * `npm run bench:compare`: the revision comparison (GET /api/sheets/:id/compare) without the
 * database, for parallel-chord trusses of 10, 50 and 200 joints with one dead case and one
 * combination, revision B carrying a heavier load at one panel point. Prints per size: the model
 * and results diff (revisionDiff), building one sheet view (what the step comparison needs per
 * run, cached afterwards), the step comparison (stepsDiff) and how many steps changed. Median of 5.
 */
import os from 'node:os';
import { revisionDiff } from '@shared/compare/revision-diff';
import { stepsDiff } from '@shared/compare/step-diff';
import { trussSolve } from '@shared/solver';
import { modelFromSketch, parallelChordSketch } from '@shared/solver/test-trusses';
import { buildCalcSheetView } from '../server/modules/calc-sheets/calc-sheet-view';
import { sheetStepsOf } from '../server/modules/sheet-revisions/revision-compare.service';

const SIZES = [
  { joints: 10, panels: 4 },
  { joints: 50, panels: 24 },
  { joints: 200, panels: 99 },
];

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
const timed = <T>(f: () => T): [T, number] => {
  const t = performance.now();
  const r = f();
  return [r, performance.now() - t];
};

const base = {
  firm: { name: 'Harrow & Vale Structural (demo)', address: '4 Tanner’s Yard, Northgate', paperSize: 'A4' as const },
  project: { name: 'Kestrel Logistics — warehouse roof', jobNumber: 'HV-2417', unitSystem: 'SI' as const },
  revision: '',
  trussName: 'bench',
  subject: 'bench',
  generatedAt: new Date(0),
};

console.log(`revision compare bench — ${os.cpus().length} cores, load average ${os.loadavg().map((l) => l.toFixed(1)).join(' ')}`);
for (const { joints, panels } of SIZES) {
  const sketch = parallelChordSketch('pratt', panels % 2 ? panels + 1 : panels, 3, 3, 10);
  sketch.combinations = [{ name: '1.35D', factors: { D: 1.35 } }];
  const a = modelFromSketch(sketch);
  const b = modelFromSketch(sketch);
  b.loadCases[0]!.loads[0]!.fy = -16;
  const ra = trussSolve(a);
  const rb = trussSolve(b);
  const diffMs: number[] = [];
  const viewMs: number[] = [];
  const stepMs: number[] = [];
  let changed = 0;
  let total = 0;
  for (let i = 0; i < 5; i++) {
    diffMs.push(timed(() => revisionDiff({ model: a, analysis: ra }, { model: b, analysis: rb }))[1]);
    const [va, ta] = timed(() => sheetStepsOf(buildCalcSheetView({ ...base, model: a, analysis: ra })));
    const [vb] = timed(() => sheetStepsOf(buildCalcSheetView({ ...base, model: b, analysis: rb })));
    viewMs.push(ta);
    const [d, ts] = timed(() => stepsDiff(va, vb));
    stepMs.push(ts);
    changed = d.changed.length;
    total = vb.length;
  }
  console.log(
    `${String(a.joints.length).padStart(3)} joints (target ${joints}): diff ${median(diffMs).toFixed(2)} ms, sheet view ${median(viewMs).toFixed(0)} ms per run, step comparison ${median(stepMs).toFixed(2)} ms; ${changed} of ${total} steps changed`,
  );
}
