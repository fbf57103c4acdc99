import { describe, expect, it } from 'vitest';
import { buildCalcSheetView } from './index';
import { sheetInput, triangleModel } from './view-fixtures';

describe('sheet view: title block', () => {
  it('when a sheet is built, then the title block carries the firm, project, subject, revision and run as given, the address on one line', () => {
    const input = sheetInput(triangleModel(), { runLabel: 'Run 7 by K. Marsh, 2026-05-13' });
    const { titleBlock, documentTitle, paper } = buildCalcSheetView(input);
    expect(titleBlock).toMatchObject({
      firm: input.firm.name,
      firmAddress: '12 Mill Row, Upper Dale',
      project: input.project.name,
      jobNumber: input.project.jobNumber,
      subject: input.subject,
      revision: input.revision,
      run: input.runLabel,
    });
    expect(documentTitle).toBe(`${input.project.jobNumber} ${input.subject} — rev ${input.revision}`);
    expect(paper).toBe(input.firm.paperSize);
  });

  it('when the project is in US customary units, then the units say kip and ft and note that the equations stay in kN and m', () => {
    const si = buildCalcSheetView(sheetInput(triangleModel())).units;
    const us = buildCalcSheetView(sheetInput(triangleModel(), { project: { name: 'P', jobNumber: 'J', unitSystem: 'US' } })).units;
    expect(si).toEqual({ system: 'SI', force: 'kN', length: 'm' });
    expect(us).toMatchObject({ system: 'US customary', force: 'kip', length: 'ft' });
    // 1 kip = 4.448 kN and 1 ft = 0.3048 m (NIST SP 811, appendix B, rounded as printed).
    expect(us.note).toContain('1 kip = 4.448 kN, 1 ft = 0.3048 m');
  });

  it('when the generation time has seconds, then the sheet prints it to the minute in UTC', () => {
    const view = buildCalcSheetView(sheetInput(triangleModel(), { generatedAt: new Date(Date.UTC(2026, 4, 14, 8, 41, 30)) }));
    expect(view.generatedAt).toBe('2026-05-14 08:41 UTC');
  });
});
