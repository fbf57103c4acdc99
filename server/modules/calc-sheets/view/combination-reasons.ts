import {
  COMBINATION_SET_RULES,
  CombinationError,
  combinationsExplain,
  combinationsIgnoredCases,
  type CombinationSetId,
  type CombinationsExplained,
} from '@shared/combinations';
import { LOAD_CATEGORY_NAMES, type Combination, type TrussModel } from '@shared/model/truss';
import type { CalcSheetView } from './types';
import type { SheetSection } from './context';

/** EN 1991-1-1 §3.3.2(1): imposed load on roofs (category H) is not applied together with snow or wind. */
const H_CLAUSE = 'EN 1991-1-1:2002 §3.3.2(1)';

const sameFactors = (a: Record<string, number>, b: Record<string, number>) => {
  const keys = Object.keys(a);
  return keys.length === Object.keys(b).length && keys.every((k) => k in b && Math.abs(a[k] - b[k]) <= 1e-12 * Math.max(1, Math.abs(a[k])));
};

/** Sets whose clauses the model's combinations cite, each with the model's combinations that cite it. */
function citedSets(combinations: readonly Combination[]): { setId: CombinationSetId; citing: Combination[] }[] {
  return (Object.keys(COMBINATION_SET_RULES) as CombinationSetId[]).flatMap((setId) => {
    const clauses = new Set(COMBINATION_SET_RULES[setId].rules.map((r) => r.clause));
    const citing = combinations.filter((c) => c.clause !== undefined && clauses.has(c.clause));
    return citing.length ? [{ setId, citing }] : [];
  });
}

function reasonLines(model: TrussModel, ex: CombinationsExplained): string[] {
  const caseWords = model.loadCases.map((c) => `${c.id} (${(LOAD_CATEGORY_NAMES[c.category] ?? c.category).toLowerCase()})`).join(', ');
  const lines = [`Formed from ${ex.basis} over the load cases ${caseWords}.`, ...ex.notes];
  lines.push('A rule that needs a variable load is not formed again with none acting: that would repeat the permanent-only combination.');
  for (const rule of ex.rules) {
    const head = `${rule.clause}, ${rule.formula}:`;
    if (rule.notFormed) lines.push(`${head} ${rule.notFormed}.`);
    else if (rule.formed.length) {
      const list = rule.formed.map((f) => `${f.name} (${f.expression})`).join('; ');
      lines.push(`${head} ${rule.formed.length === 1 ? 'one combination' : `${rule.formed.length} combinations`}: ${list}.`);
    }
    for (const d of rule.duplicates) lines.push(`${head} ${d.acting} has the same factors as ${d.sameAs}, so it is listed once, there.`);
    if (!rule.notFormed && rule.formed.length === 0 && rule.duplicates.length) lines.push(`${head} every combination it forms is listed under an earlier rule.`);
  }
  if (ex.setId.startsWith('en1990')) {
    const of = (cat: string) => model.loadCases.filter((c) => c.category === cat).map((c) => c.id);
    const [h, s, w] = [of('roof-live'), of('snow'), of('wind')];
    if (h.length && (s.length || w.length)) {
      const others = [s.length ? `snow (${s.join(', ')})` : '', w.length ? `wind (${w.join(', ')})` : ''].filter(Boolean).join(' or ');
      lines.push(
        `Here roof imposed load, category H (${h.join(', ')}), is not combined with ${others} (${H_CLAUSE}): it leads only with the permanent actions, and with ψ0 = 0 (EN 1990 Table A1.1) it accompanies nothing.`,
      );
    }
  }
  for (const c of combinationsIgnoredCases(model.loadCases)) lines.push(c.reason);
  return lines;
}

/**
 * Why the combinations are what they are, written under the combination table of the loads
 * section: for each built-in set the combinations cite, the presence patterns each rule formed,
 * those listed once because an earlier combination has the same factors, the rules not formed
 * and why, and the EN 1991-1-1 §3.3.2(1) exclusion of roof imposed load with snow and wind.
 * Combinations that were edited after the set formed them get a sentence saying so instead.
 */
export const combinationReasonsSection: SheetSection<'combinationReasons'> = {
  build({ model }) {
    const combinationReasons: CalcSheetView['combinationReasons'] = [];
    for (const { setId, citing } of citedSets(model.combinations)) {
      let ex: CombinationsExplained;
      try {
        ex = combinationsExplain(setId, model.loadCases);
      } catch (error) {
        if (!(error instanceof CombinationError)) throw error;
        combinationReasons.push({ title: COMBINATION_SET_RULES[setId].title, asFormed: false, lines: [`The set cannot be formed from these load cases: ${error.message}`] });
        continue;
      }
      const inModel = (name: string, factors: Record<string, number>) => model.combinations.some((c) => c.name === name && sameFactors(c.factors, factors));
      const missing = ex.combinations.filter((c) => !inModel(c.name, c.factors));
      const extra = citing.filter((c) => !ex.combinations.some((x) => x.name === c.name && sameFactors(x.factors, c.factors)));
      if (missing.length || extra.length) {
        const parts = [
          missing.length ? `${missing.length} of the ${ex.combinations.length} it forms from these load cases ${missing.length === 1 ? 'is' : 'are'} missing or changed (${missing.map((c) => c.name).join('; ')})` : '',
          extra.length ? `${extra.length} combination${extra.length === 1 ? '' : 's'} citing it ${extra.length === 1 ? 'is' : 'are'} not among them (${extra.map((c) => c.name).join('; ')})` : '',
        ].filter(Boolean);
        combinationReasons.push({
          title: ex.title,
          asFormed: false,
          lines: [`These combinations cite ${ex.basis} but differ from what the set forms from these load cases: ${parts.join('; ')}. They were edited by hand or formed from other cases; check each against the standard, or form the set again.`],
        });
        continue;
      }
      combinationReasons.push({ title: ex.title, asFormed: true, lines: reasonLines(model, ex) });
    }
    return { view: { combinationReasons } };
  },
};
