import type { SheetSection } from './context';

const STATUS_WORDS: Record<string, string> = {
  draft: 'draft',
  'in-check': 'in check',
  returned: 'returned',
  checked: 'checked',
  issued: 'issued',
  superseded: 'superseded',
};

/**
 * The cover's revision table: each revision of the truss up to this sheet's, its date, its
 * status and one line per kind of change against the revision before (geometry, supports,
 * loads, combinations, forces and reactions). Unnumbered (it is part of the cover), so adding it
 * moves no step's number. A run's draft, which is no revision, prints none.
 */
export const revisionTableSection: SheetSection<'revisionTable'> = {
  build({ input }) {
    return {
      view: {
        revisionTable: {
          rows: (input.revisionHistory ?? []).map((r) => ({ ...r, status: STATUS_WORDS[r.status] ?? r.status })),
        },
      },
    };
  },
};
