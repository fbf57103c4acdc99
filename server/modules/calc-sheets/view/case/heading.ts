import type { CaseResult } from '@shared/solver';
import type { CasePart } from './case-context';

const METHOD_NAMES: Record<CaseResult['method'], string> = {
  joints: 'method of joints',
  'joints-and-simultaneous': 'method of joints, with a simultaneous solve where no joint had two or fewer unknowns',
  stiffness: 'direct stiffness method',
};

/** The case's heading: its anchor, title and the method that solved it. */
export const caseHeading: CasePart<'id' | 'anchor' | 'caseId' | 'title' | 'method'> = {
  build({ model, result }) {
    const lc = model.loadCases.find((c) => c.id === result.caseId);
    return {
      id: result.caseId,
      anchor: `case-${result.caseId.replace(/[^A-Za-z0-9_-]/g, '_')}`,
      caseId: result.caseId,
      title: `Load case ${result.caseId}${lc && lc.name !== result.caseId ? ` — ${lc.name}` : ''}`,
      method: METHOD_NAMES[result.method],
    };
  },
};
