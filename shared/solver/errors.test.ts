import { describe, expect, it } from 'vitest';
import type { TrussModel } from '@shared/model/truss';
import { SolverError, type SolverErrorCode } from './errors';
import { trussSolve } from './solve';
import { modelFromSketch } from './test-trusses';

const base = (): TrussModel =>
  modelFromSketch({
    joints: [['A', 0, 0], ['B', 8, 0], ['C', 4, 3], ['D', 4, 0]],
    members: [['A', 'C'], ['C', 'B'], ['A', 'D'], ['D', 'B'], ['C', 'D']],
    supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
    cases: [{ id: 'D', loads: [['C', 0, -10]] }],
  });

function failure(model: TrussModel): SolverError {
  try {
    trussSolve(model);
  } catch (e) {
    if (e instanceof SolverError) return e;
    throw e;
  }
  throw new Error('expected a SolverError, got a result');
}

const cases: [string, (m: TrussModel) => void, SolverErrorCode, RegExp][] = [
  ['a load refers to a joint that does not exist', (m) => m.loadCases[0].loads.push({ joint: 'Z', fx: 0, fy: -1 }), 'unknown-joint', /load of case D refers to joint "Z"/],
  ['a support refers to a joint that does not exist', (m) => m.supports.push({ joint: 'Q', kind: 'pin' }), 'unknown-joint', /pin support refers to joint "Q"/],
  ['a member refers to a joint that does not exist', (m) => m.members.push({ id: 'CX', tag: 'CX', from: 'C', to: 'X' }), 'unknown-joint', /Member CX refers to joint "X"/],
  ['a joint has two supports', (m) => m.supports.push({ joint: 'B', kind: 'pin' }), 'duplicate-support', /Joint B has two supports/],
  ['a member has zero length', (m) => m.members.push({ id: 'DD', tag: 'DD', from: 'D', to: 'D' }), 'zero-length-member', /Member DD joins joint D to itself/],
  ['two joints coincide and a member joins them', (m) => {
    m.joints.push({ id: 'E', tag: 'E', x: 4, y: 0 });
    m.members.push({ id: 'DE', tag: 'DE', from: 'D', to: 'E' });
  }, 'zero-length-member', /Member DE joins joint D to joint E at the same point/],
  ['a coordinate is NaN', (m) => { m.joints[2].x = Number.NaN; }, 'non-finite-value', /Joint C x is NaN/],
  ['a load is infinite', (m) => { m.loadCases[0].loads[0].fy = Number.POSITIVE_INFINITY; }, 'non-finite-value', /load at joint C, fy is Infinity/],
  ['a roller angle is NaN', (m) => { m.supports[1] = { joint: 'B', kind: 'roller', angleDeg: Number.NaN }; }, 'non-finite-value', /Roller at joint B angle is NaN/],
  ['the model has no supports', (m) => { m.supports = []; }, 'no-supports', /no supports/],
  ['the model has no members', (m) => { m.members = []; }, 'empty-model', /no joints or no members/],
  ['two joints share an id', (m) => m.joints.push({ id: 'A', tag: 'A2', x: 9, y: 9 }), 'duplicate-id', /Two joints have the id "A"/],
  ['a combination names a missing load case', (m) => m.combinations.push({ name: 'C9', factors: { D: 1.2, L: 1.6 } }), 'unknown-load-case', /Combination C9 has a factor for load case "L"/],
  ['a member has a negative EA', (m) => { m.members[0].EA = -5; }, 'non-finite-value', /Member AC EA is -5/],
];

describe('bad input', () => {
  for (const [what, change, code, message] of cases) {
    it(`when ${what}, then a ${code} error names it`, () => {
      const m = base();
      change(m);
      const err = failure(m);
      expect(err.code).toBe(code);
      expect(err.message).toMatch(message);
    });
  }
});
