import { describe, expect, it } from 'vitest';
import { buildCalcSheetView } from './index';
import { sheetInput, triangleModel } from './view-fixtures';

describe('sheet view: signatures', () => {
  it('when nobody has signed yet, then prepared shows a dash, checked says not yet checked and issued stays empty', () => {
    const { titleBlock } = buildCalcSheetView(sheetInput(triangleModel()));
    expect(titleBlock).toMatchObject({
      preparedBy: '—',
      preparedDate: '',
      checkedBy: '— (not yet checked)',
      checkedDate: '',
      issuedBy: '',
      issuedDate: '',
    });
  });

  it('when the sheet is prepared, checked and issued, then each line prints the name and date as signed', () => {
    const signed = {
      preparedBy: { name: 'Ines Calloway', date: '2026-05-12' },
      checkedBy: { name: 'Tomasz Reid', date: '2026-05-13' },
      issuedBy: { name: 'Ines Calloway', date: '2026-05-14' },
    };
    const { titleBlock } = buildCalcSheetView(sheetInput(triangleModel(), signed));
    expect(titleBlock).toMatchObject({
      preparedBy: 'Ines Calloway',
      preparedDate: '2026-05-12',
      checkedBy: 'Tomasz Reid',
      checkedDate: '2026-05-13',
      issuedBy: 'Ines Calloway',
      issuedDate: '2026-05-14',
    });
  });
});
