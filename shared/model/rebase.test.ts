import { describe, expect, it } from 'vitest';
import { modelRebase } from './rebase';
import type { TrussModel } from './truss';

// Plain bookkeeping, no engineering source needed: positions are compared within a tolerance.
const previous: TrussModel = {
  joints: [
    { id: 'j1', tag: 'A', x: 0, y: 0 },
    { id: 'j2', tag: 'B', x: 4, y: 0 },
    { id: 'j3', tag: 'C', x: 2, y: 1 },
  ],
  members: [
    { id: 'm1', tag: 'AB', from: 'j1', to: 'j2', group: 'bottom-chord', EA: 50000 },
    { id: 'm2', tag: 'AC', from: 'j1', to: 'j3' },
    { id: 'm3', tag: 'BC', from: 'j2', to: 'j3', section: '45x145 C24' },
  ],
  supports: [
    { joint: 'j1', kind: 'pin' },
    { joint: 'j2', kind: 'roller', angleDeg: 90 },
  ],
  loadCases: [{ id: 'D', name: 'Dead', category: 'dead', loads: [{ joint: 'j3', fx: 0, fy: -10 }] }],
  combinations: [{ name: 'C1', factors: { D: 1.35 } }],
};

describe('modelRebase', () => {
  it('when the new drawing has the same joints under new ids, then supports, loads and properties follow by position', () => {
    const { model, dropped } = modelRebase(
      previous,
      {
        joints: [
          { id: 'j1', tag: 'A', x: 2.0004, y: 1 },
          { id: 'j2', tag: 'B', x: 0, y: 0.0003 },
          { id: 'j3', tag: 'C', x: 4, y: 0 },
        ],
        members: [
          { id: 'm1', tag: 'AB', from: 'j1', to: 'j2' },
          { id: 'm2', tag: 'BC', from: 'j2', to: 'j3' },
          { id: 'm3', tag: 'AC', from: 'j1', to: 'j3' },
        ],
      },
      0.001,
    );
    expect(model.supports).toEqual([
      { joint: 'j2', kind: 'pin' },
      { joint: 'j3', kind: 'roller', angleDeg: 90 },
    ]);
    expect(model.loadCases[0].loads).toEqual([{ joint: 'j1', fx: 0, fy: -10 }]);
    expect(model.members.find((m) => m.id === 'm2')).toMatchObject({ group: 'bottom-chord', EA: 50000 });
    expect(model.members.find((m) => m.id === 'm3')).toMatchObject({ section: '45x145 C24' });
    expect(model.combinations).toEqual(previous.combinations);
    expect(dropped).toEqual({ supports: [], loads: [], memberProperties: [] });
  });

  it('when a loaded joint is gone from the new drawing, then its load is dropped and named', () => {
    const { model, dropped } = modelRebase(
      previous,
      { joints: [{ id: 'j1', tag: 'A', x: 0, y: 0 }, { id: 'j2', tag: 'B', x: 4, y: 0 }], members: [{ id: 'm1', tag: 'AB', from: 'j1', to: 'j2' }] },
      0.001,
    );
    expect(model.loadCases[0].loads).toEqual([]);
    expect(dropped.loads).toEqual(['D at C']);
    expect(dropped.memberProperties).toEqual(['BC']);
  });

  it('when there is no previous model, then the geometry starts an empty model', () => {
    const { model } = modelRebase(null, { joints: previous.joints, members: previous.members }, 0.001);
    expect(model.supports).toEqual([]);
    // the geometry's member m1 carries the group its drawing suggested; its E and material stay behind
    expect(model.members[0]).toEqual({ id: 'm1', tag: 'AB', from: 'j1', to: 'j2', group: 'bottom-chord' });
    expect(model.members[1]).toEqual({ id: previous.members[1].id, tag: previous.members[1].tag, from: previous.members[1].from, to: previous.members[1].to, ...(previous.members[1].group ? { group: previous.members[1].group } : {}) });
  });

  it('when a new drawing suggests another group than the engineer set, then the engineer\'s group is kept', () => {
    const geometry = { joints: previous.joints, members: previous.members.map((m) => ({ id: m.id, tag: m.tag, from: m.from, to: m.to, group: 'web' as const })) };
    const { model } = modelRebase(previous, geometry, 0.001);
    expect(model.members[0].group).toBe('bottom-chord');
  });
});
