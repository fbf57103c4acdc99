import { describe, expect, it } from 'vitest';
import { layerGroupHint } from './groups';

// The layer-name rules written down in groups.ts (common drafting practice, no source): each
// case below is one of those rules read by hand.
describe('layerGroupHint', () => {
  const cases: [string, ReturnType<typeof layerGroupHint>][] = [
    ['CHORDS', 'chord'],
    ['chord', 'chord'],
    ['WEBS', 'web'],
    ['Web', 'web'],
    ['TOP', 'top-chord'],
    ['BOTTOM', 'bottom-chord'],
    ['TOP CHORD', 'top-chord'],
    ['Bottom chord', 'bottom-chord'],
    ['TC', 'top-chord'],
    ['BC', 'bottom-chord'],
    ['truss-tc', 'top-chord'],
    ['S_TRUSS_BC_2', 'bottom-chord'],
    ['TOPCHORD', 'top-chord'],
    ['LOWERCHORDS', 'bottom-chord'],
    ['UPPER', 'top-chord'],
    ['DIAG', 'web'],
    ['DIAGONALS', 'web'],
    ['VERT', 'web'],
    ['VERT2', 'web'],
    ['posts', 'web'],
    ['TC+BC', 'chord'],
    ['WEB CHORD', null],
    ['TRUSS', null],
    ['0', null],
    ['BCX', null],
    ['DIMENSIONS', null],
  ];
  for (const [name, hint] of cases) {
    it(`when a layer is called "${name}", then it suggests ${hint ?? 'nothing'}`, () => {
      expect(layerGroupHint(name)).toBe(hint);
    });
  }
});
