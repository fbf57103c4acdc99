import type { TrussModel } from '@shared/model/truss';
import { modelFromSketch, type TrussSketch } from '@shared/solver/test-trusses';
import { roofTakeoff, type TakeoffMethod } from '@shared/takeoff';

/** Sample trusses of our own for sheet tests (the demo truss, a K-truss, a roof loading). */

export function kTruss(): TrussSketch {
  // Four panels of 3 m, depth 4 m; a K in every panel: each interior vertical has a mid-height joint
  // Mi from which two diagonals run to the corners of the panel beside it; end posts. Invented geometry.
  const a = 3;
  const h = 4;
  const joints: [string, number, number][] = [];
  for (let i = 0; i <= 4; i++) joints.push([`L${i}`, i * a, 0], [`U${i}`, i * a, h]);
  for (let i = 1; i <= 3; i++) joints.push([`M${i}`, i * a, h / 2]);
  const members: [string, string][] = [];
  for (let i = 0; i < 4; i++) members.push([`L${i}`, `L${i + 1}`], [`U${i}`, `U${i + 1}`]);
  members.push(['L0', 'U0'], ['L4', 'U4']);
  for (let i = 1; i <= 3; i++) members.push([`L${i}`, `M${i}`], [`M${i}`, `U${i}`]);
  // K diagonals: left half point toward mid-span from the left panel's corners, mirrored right.
  // The third panel has a single diagonal M2–L3 (a full K there would make it indeterminate).
  members.push(['U0', 'M1'], ['L0', 'M1'], ['U1', 'M2'], ['L1', 'M2'], ['M2', 'L3'], ['M3', 'U4'], ['M3', 'L4']);
  return {
    joints,
    members,
    supports: [{ at: 'L0', kind: 'pin' }, { at: 'L4', kind: 'roller' }],
    cases: [{ id: 'D', loads: [['U1', 0, -17.3], ['U2', 0, -17.3], ['U3', 0, -17.3], ['L2', 2.9, -6.1]] }],
  };
}

/** The demo project's T1 geometry: 12 m span, 3 m rise, six 2 m panels, Howe web (invented). */
export function demoTruss(): TrussModel {
  const top = (x: number) => (x <= 6 ? x / 2 : (12 - x) / 2);
  const joints: [string, number, number][] = [];
  for (let i = 0; i <= 6; i++) joints.push([`L${i}`, 2 * i, 0]);
  for (let i = 1; i <= 5; i++) joints.push([`U${i}`, 2 * i, top(2 * i)]);
  const at = (i: number) => (i === 0 ? 'L0' : i === 6 ? 'L6' : `U${i}`);
  const members: [string, string][] = [];
  for (let i = 0; i < 6; i++) members.push([`L${i}`, `L${i + 1}`], [at(i), at(i + 1)]);
  for (let i = 1; i <= 5; i++) members.push([`L${i}`, `U${i}`]);
  members.push(['U1', 'L2'], ['U2', 'L3'], ['L3', 'U4'], ['L4', 'U5']);
  return modelFromSketch({ joints, members, supports: [{ at: 'L0', kind: 'pin' }, { at: 'L6', kind: 'roller' }], cases: [] });
}

export function withTakeoff(model: TrussModel, method: TakeoffMethod, spacing: number | number[]) {
  const topChord = ['L0', 'U1', 'U2', 'U3', 'U4', 'U5', 'L6'];
  const takeoff = roofTakeoff({
    joints: model.joints,
    topChordJoints: topChord,
    areaLoads: [
      { caseId: 'D', q: 0.87, basis: 'slope' },
      { caseId: 'S', q: 1.13, basis: 'plan' },
    ],
    spacing,
    trussCount: Array.isArray(spacing) ? spacing.length + 1 : 6,
    trussIndex: 1,
    method,
  });
  model.loadCases = [
    { id: 'D', name: 'Roofing, purlins and ceiling', category: 'dead', loads: takeoff.caseLoads.D },
    { id: 'S', name: 'Snow on the roof', category: 'snow', loads: takeoff.caseLoads.S },
  ];
  return { model, takeoffSteps: takeoff.steps };
}


/** The demo truss with dead and pattern-checked snow through the purlins and wind normal to the slopes (invented loads). */
export function withWindAndPatterns(model: TrussModel, method: TakeoffMethod, spacing: number | number[], trussIndex: number) {
  const topChord = ['L0', 'U1', 'U2', 'U3', 'U4', 'U5', 'L6'];
  const takeoff = roofTakeoff({
    joints: model.joints,
    topChordJoints: topChord,
    areaLoads: [
      { caseId: 'D', q: 0.87, basis: 'slope', category: 'dead' },
      { caseId: 'S', q: 1.13, basis: 'plan', category: 'snow', patterns: true },
    ],
    wind: { caseId: 'W', category: 'wind', q: 0.737, windward: 'left', cWindward: -0.37, cLeeward: -0.53 },
    spacing,
    trussCount: Array.isArray(spacing) ? spacing.length + 1 : 6,
    trussIndex,
    method,
  });
  model.loadCases = [
    { id: 'D', name: 'Roofing, purlins and ceiling', category: 'dead', loads: takeoff.caseLoads.D },
    { id: 'S', name: 'Snow, unfavourable spans', category: 'snow', loads: takeoff.caseLoads.S },
    { id: 'W', name: 'Wind across the ridge', category: 'wind', loads: takeoff.caseLoads.W },
  ];
  return { model, takeoffSteps: takeoff.steps };
}
