// @vitest-environment jsdom
import { afterEach, describe, expect, it } from 'vitest';
import { cleanup, render } from '@testing-library/react';
import { loadLetterOf } from '@shared/solver';
import { modelFromSketch } from '@shared/solver/test-trusses';
import { roofTakeoff, takeoffStepKatex } from '@shared/takeoff';
import { alignedRows, breakableTex } from '@shared/text/breakable-tex';
import type { TrussModel } from '@shared/model/truss';
import { TakeoffPreview } from './takeoff-preview';

/**
 * The app's roof loading preview writes its joint loads with the letter the calc sheet uses
 * (loadLetterOf, one shared rule): P, unless a tag of the truss could be read as P. Invented
 * trusses: a 3-4-5 gable with its apex tagged P, and the same with the apex tagged T.
 */
function gable(apex: string): TrussModel {
  return modelFromSketch({
    joints: [['A', 0, 0], ['B', 8, 0], [apex, 4, 3], ['M', 4, 0]],
    members: [['A', 'M'], ['M', 'B'], ['A', apex], [apex, 'B'], ['M', apex]],
    supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
    cases: [],
  });
}

function previewOf(model: TrussModel) {
  const id = (tag: string) => model.joints.find((j) => j.tag === tag)!.id;
  const apex = model.joints.find((j) => j.x === 4 && j.y === 3)!.tag;
  const result = roofTakeoff({
    joints: model.joints,
    topChordJoints: [id('A'), id(apex), id('B')],
    areaLoads: [{ caseId: 'S', q: 1.2, basis: 'plan' }],
    spacing: 5,
    trussCount: 4,
    trussIndex: 1,
    method: 'exact',
  });
  const view = render(<TakeoffPreview result={result} caseNames={new Map([['S', 'Snow']])} loadLetter={loadLetterOf(model)} />);
  // KaTeX keeps each formula's source in its MathML annotation.
  const sources = [...view.container.querySelectorAll('annotation')].map((a) => a.textContent ?? '');
  return { result, sources };
}

afterEach(cleanup);

describe('roof loading preview: load letter', () => {
  it('when a joint is tagged P, then the preview writes the joint loads Q, the same text as the sheet, and never P_{…}', () => {
    const model = gable('P');
    expect(loadLetterOf(model)).toBe('Q');
    const { result, sources } = previewOf(model);
    const loads = sources.filter((s) => /_\{\\text\{[A-Z]+\},y\}/.test(s) && /Q_\{/.test(s));
    expect(loads.length).toBeGreaterThan(0);
    expect(sources.join(' ')).not.toMatch(/(^|[^a-zA-Z\\])P_\{/);
    // The sheet's takeoff section writes each step with takeoffStepKatex and loadLetterOf(model): the same sources.
    const sheet = result.steps.flatMap((s) => alignedRows(takeoffStepKatex(s, { loadLetter: loadLetterOf(model) })));
    const typeset = (tex: string) => `\\displaystyle ${breakableTex(tex)}`.replace(/\s+/g, '');
    expect(sources.map((s) => s.replace(/\s+/g, ''))).toEqual(sheet.map(typeset));
  });

  it('when no tag reads as P, then the preview writes the joint loads P', () => {
    const { sources } = previewOf(gable('T'));
    expect(sources.join(' ')).toMatch(/(^|[^a-zA-Z\\])P_\{/);
    expect(sources.join(' ')).not.toMatch(/(^|[^a-zA-Z\\])Q_\{/);
  });
});
