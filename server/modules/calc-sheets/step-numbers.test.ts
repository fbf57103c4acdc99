import { describe, expect, it } from 'vitest';
import { placeOf, type SheetPlace } from './step-numbers';

// How a comment's anchor finds the number the sheet prints (common practice of calc sheets,
// no source: a step is cited by section and place, "6.4"; a table by its section, "6").
const places = new Map<string, SheetPlace>([
  ['stability', { number: '4', title: 'Stability and determinacy' }],
  ['case-D', { number: '6', title: 'Load case D' }],
  ['case-DL', { number: '7', title: 'Load case DL' }],
  ['case-D/joint-C', { number: '6.4', title: 'Joint C' }],
]);

describe('placeOf', () => {
  it('when the anchor is a numbered step, then it is that step', () => {
    expect(placeOf('case-D/joint-C', places)).toEqual({ number: '6.4', title: 'Joint C' });
  });

  it('when the anchor is a table or sub-heading inside a section, then it is the section, the longest matching one', () => {
    expect(placeOf('case-D-forces', places)?.number).toBe('6');
    expect(placeOf('case-DL-forces', places)?.number).toBe('7');
    expect(placeOf('case-D/joint-Z', places)?.number).toBe('6');
  });

  it('when the anchor is in no numbered part, then there is no place (a step number never serves as a section)', () => {
    expect(placeOf('geometry-table', places)).toBeNull();
    expect(placeOf('case-D/joint-C-extra', places)?.number).toBe('6');
  });
});
