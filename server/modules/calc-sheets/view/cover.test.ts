import { describe, expect, it } from 'vitest';
import { buildCalcSheetView } from './index';
import { sheetInput, triangleModel } from './view-fixtures';

describe('sheet view: cover', () => {
  it('when client, site and run are given, then the cover lists them with the units and the time to the minute', () => {
    const input = sheetInput(triangleModel(), {
      project: { name: 'Fenwick depot — canopy', jobNumber: 'OL-0912', client: 'Fenwick Haulage', site: 'Plot 4, Quarry Road', unitSystem: 'SI' },
      runLabel: 'Run 7',
    });
    const { cover } = buildCalcSheetView(input);
    expect(cover.rows).toEqual([
      { label: 'Project', value: 'Fenwick depot — canopy' },
      { label: 'Job number', value: 'OL-0912' },
      { label: 'Client', value: 'Fenwick Haulage' },
      { label: 'Site', value: 'Plot 4, Quarry Road' },
      { label: 'Truss', value: input.trussName },
      { label: 'Revision', value: input.revision },
      { label: 'Units', value: 'SI (kN, m)' },
      { label: 'Analysis run', value: 'Run 7' },
      { label: 'Generated', value: '2026-05-14 08:41 UTC' },
    ]);
  });

  it('when client, site and run are not given, then their lines are left out', () => {
    const labels = buildCalcSheetView(sheetInput(triangleModel())).cover.rows.map((r) => r.label);
    expect(labels).not.toContain('Client');
    expect(labels).not.toContain('Site');
    expect(labels).not.toContain('Analysis run');
  });

  it('when a stable truss is built, then the contents run in sheet order and each section is numbered from 1 in that order', () => {
    const view = buildCalcSheetView(sheetInput(triangleModel(['D', 'W'])));
    expect(view.cover.contents.map((c) => c.anchor)).toEqual(['design-basis', 'geometry', 'supports', 'loads', 'stability', 'case-D', 'case-W', 'combinations', 'bearings', 'residual']);
    expect(Object.entries(view.numbers)).toEqual(view.cover.contents.map((c, i) => [c.anchor, String(i + 1)]));
    expect(view.cover.summary.map((s) => s.label)).toEqual(['Stability', 'Load cases', 'Combinations', 'Largest tension', 'Largest compression', 'Uplift', 'Largest residual']);
  });
});
