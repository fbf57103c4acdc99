import { describe, expect, it } from 'vitest';
import { roofTakeoff } from '@shared/takeoff';
import { modelFromSketch, parallelChordSketch } from '@shared/solver/test-trusses';
import { buildCalcSheetView } from './index';
import { katexText, sheetInput, triangleModel } from './view-fixtures';

describe('sheet view: roof load takeoff', () => {
  it('when the loads came from a takeoff, then each step prints under its own id and an interior purlin line load is q times the panel width', () => {
    // Four 2.5 m panels, flat top chord; 0.6 kPa on plan, trusses at 4 m.
    const model = modelFromSketch(parallelChordSketch('pratt', 4, 2.5, 2, 1));
    const top = model.joints.filter((j) => j.tag.startsWith('U'));
    const takeoff = roofTakeoff({
      joints: model.joints,
      topChordJoints: top.map((j) => j.id),
      areaLoads: [{ caseId: 'D', q: 0.6, basis: 'plan' }],
      spacing: 4,
      trussCount: 5,
      trussIndex: 2,
      method: 'exact',
    });
    const view = buildCalcSheetView(sheetInput(model, { takeoffSteps: takeoff.steps }));
    expect(view.takeoff.map((s) => s.id)).toEqual(takeoff.steps.map((s) => s.id));
    expect(view.takeoff.every((s) => s.lines.length === s.tex.length && s.lines.length >= 1 && s.lines.every((l) => l.includes('class="katex"')))).toBe(true);
    // An interior purlin takes half of each neighbouring panel: b = 2.5 m, w = q·b = 0.6 × 2.5 = 1.50 kN/m
    // (tributary width, common practice, no source).
    const lineStep = takeoff.steps.find((t) => t.kind === 'line-load' && t.jointTag === 'U2');
    const line = view.takeoff.find((s) => s.id === lineStep?.id);
    expect(katexText(line!.lines.join(" "))).toContain((0.6 * 2.5).toFixed(2));
    expect(view.cover.contents.map((c) => c.anchor)).toContain('takeoff');
  });

  it('when the loads were entered by hand, then there is no takeoff section and no contents line for it', () => {
    const view = buildCalcSheetView(sheetInput(triangleModel()));
    expect(view.takeoff).toEqual([]);
    expect(view.cover.contents.map((c) => c.anchor)).not.toContain('takeoff');
  });

  it('when snow is checked for span patterns and wind acts on the slopes, then the pattern step names the pattern and its clauses and the wind step states its signs', () => {
    // Four 2.5 m panels, flat top chord; three spans of 4 m, the first interior truss.
    const model = modelFromSketch(parallelChordSketch('pratt', 4, 2.5, 2, 1));
    const top = model.joints.filter((j) => j.tag.startsWith('U'));
    const takeoff = roofTakeoff({
      joints: model.joints,
      topChordJoints: top.map((j) => j.id),
      areaLoads: [{ caseId: 'S', q: 0.8, basis: 'plan', category: 'snow', patterns: true }],
      wind: { caseId: 'W', category: 'wind', q: 0.6, windward: 'left', cWindward: -0.7, cLeeward: -0.5 },
      spacing: 4,
      trussCount: 4,
      trussIndex: 1,
      method: 'exact',
    });
    const view = buildCalcSheetView(sheetInput(model, { takeoffSteps: takeoff.steps }));
    const pattern = view.takeoff.find((s) => s.id === 'takeoff/S/span-pattern');
    expect(pattern?.title).toContain('spans 1 and 2 loaded');
    expect(pattern?.note).toMatch(/ASCE\/SEI 7-16 4\.3\.3/);
    expect(pattern?.note).toMatch(/7\.5/);
    const wind = view.takeoff.find((s) => s.id.startsWith('takeoff/W/') && s.id.endsWith('/wind'));
    expect(wind?.note).toMatch(/positive towards the surface/);
    expect(katexText(wind!.lines.join(" "))).toMatch(/sin/);
  });
});
