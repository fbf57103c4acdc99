import type { CalcSheetInput, CalcSheetView } from './types';

type SignatureFields = Pick<CalcSheetView['titleBlock'], 'preparedBy' | 'preparedDate' | 'checkedBy' | 'checkedDate' | 'issuedBy' | 'issuedDate'>;

/**
 * The signature lines of the title block: who prepared, checked and issued the sheet and when,
 * as they should print. An unchecked sheet says so; the issued line stays empty until issue.
 */
export function signatureFields(input: Pick<CalcSheetInput, 'preparedBy' | 'checkedBy' | 'issuedBy'>): SignatureFields {
  return {
    preparedBy: input.preparedBy?.name ?? '—',
    preparedDate: input.preparedBy?.date ?? '',
    checkedBy: input.checkedBy?.name ?? '— (not yet checked)',
    checkedDate: input.checkedBy?.date ?? '',
    issuedBy: input.issuedBy?.name ?? '',
    issuedDate: input.issuedBy?.date ?? '',
  };
}
