import type { Combination, LoadCase, LoadCategory } from '@shared/model/truss';
import { loadCategorySchema } from '@shared/model/truss';
import { COMBINATION_SET_RULES, type CombinationRule, type CombinationSetId, type RuleGroup, type RuleTerm } from './sets';

/** Stable codes of the combination builder's errors. */
export type CombinationErrorCode =
  | 'unknown-set'
  | 'duplicate-load-case'
  | 'unknown-category'
  | 'missing-case-value'
  | 'non-finite-value'
  | 'too-many-combinations';

/** Thrown for input the builder cannot turn into combinations; the message names the case or set. */
export class CombinationError extends Error {
  readonly code: CombinationErrorCode;
  constructor(code: CombinationErrorCode, message: string) {
    super(message);
    this.name = 'CombinationError';
    this.code = code;
  }
}

/**
 * A built-in combination: a model {@link Combination} (name, factors by load-case id, clause)
 * plus where it came from and a note per factor, so every factor on the calc sheet can be traced
 * to its clause.
 */
export interface CodeCombination extends Combination {
  clause: string;
  setId: CombinationSetId;
  /** The rule of the set, e.g. "3" or "6.10b leading snow". */
  rule: string;
  /** The combination as the standard writes it, e.g. "1.2D + 1.6(Lr or S or R) + (L or 0.5W)". */
  formula: string;
  /** The factors written out over the case ids, e.g. "1.2 D + 1.6 S1 + 0.5 W1". */
  expression: string;
  /** Load case id → why its factor is what it is, with the clause. */
  factorNotes: Record<string, string>;
  /** Ids of the cases that act (factor ≠ 0), in the order of the rule. */
  acting: string[];
  /** Ids of the variable cases left out of this combination (absent, or an alternative not chosen). */
  notActing: string[];
  /** Clauses of other rules that give the same factors (listed once, here). */
  alsoBy: string[];
}

/** The most combinations one set may produce before the builder refuses (too many alternatives). */
export const COMBINATIONS_MAX = 2000;

type CaseRef = Pick<LoadCase, 'id' | 'category'> & Partial<Pick<LoadCase, 'name'>>;

function assertCases(loadCases: readonly CaseRef[]): void {
  const seen = new Set<string>();
  for (const c of loadCases) {
    if (!loadCategorySchema.safeParse(c.category).success) {
      throw new CombinationError(
        'unknown-category',
        `Load case "${c.id}" has category "${String(c.category)}"; use one of ${loadCategorySchema.options.join(', ')}.`,
      );
    }
    if (seen.has(c.id)) {
      throw new CombinationError('duplicate-load-case', `Load case id "${c.id}" is used twice; give each load case its own id.`);
    }
    seen.add(c.id);
  }
}

/** Writes a factor without trailing zeros: 1.2, 0.45, 1.1475, 1. */
function factorText(f: number): string {
  return String(Math.round(f * 1e6) / 1e6);
}

interface Choice {
  caseId: string;
  term: RuleTerm;
}

function ruleExpand(rule: CombinationRule, byCategory: Map<LoadCategory, CaseRef[]>): Choice[][] {
  // Alternatives per group. 'all': every case of the category with the unfavourable factor and,
  // where the rule gives one, every case with the favourable factor (the whole permanent action
  // takes one factor). 'one-of': one alternative per case of a listed category, plus "none
  // acting" (a variable action is left out where it is favourable); a principal group has no
  // "none" alternative, and a rule whose principal category has no case is not formed.
  const groups: Choice[][][] = [];
  for (const group of rule.groups) {
    if (group.kind === 'all') {
      const members = byCategory.get(group.term.category) ?? [];
      const terms = group.favourable && members.length > 0 ? [group.term, group.favourable] : [group.term];
      groups.push(terms.map((term) => members.map((c) => ({ caseId: c.id, term }))));
      continue;
    }
    const alternatives = group.options.flatMap((term) =>
      (byCategory.get(term.category) ?? []).map((c) => [{ caseId: c.id, term }]),
    );
    if (group.principal && alternatives.length === 0) return [];
    groups.push(group.principal ? alternatives : [...alternatives, []]);
  }
  let combos: Choice[][] = [[]];
  for (const alternatives of groups) {
    const next: Choice[][] = [];
    for (const partial of combos) for (const alternative of alternatives) next.push([...partial, ...alternative]);
    combos = next;
    if (combos.length > COMBINATIONS_MAX) {
      throw new CombinationError(
        'too-many-combinations',
        `Rule ${rule.clause} gives more than ${COMBINATIONS_MAX} combinations from these load cases; merge cases that always act together.`,
      );
    }
  }
  return combos.filter((choices) => {
    if (choices.length === 0) return false;
    // A 'variable' rule needs at least one variable action acting (else it repeats 1.4D or D).
    return rule.needs === 'always' || choices.some((x) => x.term.category !== 'dead');
  });
}

/**
 * The name tail that says which loads act: "D + S1 + W1" or "D + S1; W1 not acting". The
 * not-acting list holds the variable cases that some combination of the set could carry.
 */
function actingText(choices: Choice[], variableIds: readonly string[]): string {
  const acting = choices.map((x) => x.caseId);
  const absent = variableIds.filter((id) => !acting.includes(id));
  return absent.length === 0 ? acting.join(' + ') : `${acting.join(' + ')}; ${absent.join(', ')} not acting`;
}

/** Case ids with their factors, sorted: equal keys mean identical combinations. */
function factorKey(choices: Choice[]): string {
  return choices
    .map((x) => `${x.caseId}=${factorText(x.term.factor)}`)
    .sort()
    .join('|');
}

/** Combination names are at most this long (the model's limit). */
const NAME_MAX = 80;

const LETTERS = 'abcdefghijklmnopqrstuvwxyz';
function suffix(i: number): string {
  return i < 26 ? LETTERS[i] : `${LETTERS[Math.floor(i / 26) - 1]}${LETTERS[i % 26]}`;
}

/**
 * Builds the combinations of a built-in set over the given load cases.
 *
 * - Dead cases act together, each with the dead-load factor; where the set has a favourable
 *   factor (EN 1990 γ_G,inf = 1.00), each rule is also formed with it on the whole permanent action.
 * - Each case of a variable category (live, roof live, snow, wind) is an alternative: one case
 *   per category at a time ("Lr or S or R" takes each roof live and snow case in turn). Split a
 *   variable load into several cases only when they are alternatives (e.g. wind from the left or
 *   the right); cases that always act together belong in one case.
 * - Every variable action is also left out in turn (ASCE/SEI 7-16 §2.3.1, §2.4.1: "the effects
 *   of one or more loads not acting"; EN 1990 Table A1.2(B): γ_Q = 0 where favourable), so the
 *   envelope over the result equals the envelope over every presence pattern of the rules. The
 *   principal (leading) load of a rule is always present; a rule whose principal category has no
 *   case is not formed. The permanent-only rules (1.4D, D, γ_G G) stay.
 * - Wind is taken in the direction its case was entered; no sign reversal is added.
 * - Cases of category 'other' appear in no built-in combination (see {@link combinationsIgnoredCases}).
 * - Identical factor sets from different rules are kept once (the first), naming the others in `alsoBy`.
 *
 * @returns combinations in the order of the standard's rules; names like "LRFD 3b: D + S; W not acting"
 * @throws CombinationError 'unknown-set', 'duplicate-load-case', 'unknown-category', 'too-many-combinations'
 */
export function combinationsBuild(setId: CombinationSetId, loadCases: readonly CaseRef[]): CodeCombination[] {
  return combinationsExplain(setId, loadCases).combinations;
}

/** What one rule of a set gave over the load cases, for the reasons on the calc sheet. */
export interface RuleOutcome {
  /** The rule's id in its set, e.g. "3" or "6.10b leading snow". */
  id: string;
  clause: string;
  formula: string;
  /** The combinations it formed and that are listed: name and factors over the case ids. */
  formed: { name: string; expression: string }[];
  /** Presence patterns it formed whose factors equal a combination listed earlier: listed once, there. */
  duplicates: { acting: string; sameAs: string }[];
  /** Why the rule formed nothing, in words; absent when it formed something. */
  notFormed?: string;
}

/** The combinations of a set and, rule by rule, what was formed, what was listed once and what was not formed and why. */
export interface CombinationsExplained {
  setId: CombinationSetId;
  title: string;
  basis: string;
  notes: string[];
  combinations: CodeCombination[];
  rules: RuleOutcome[];
}

/** Category names as the reasons write them. */
const CATEGORY_WORDS: Record<LoadCategory, string> = {
  dead: 'dead load',
  live: 'live (imposed) load',
  'roof-live': 'roof live load',
  snow: 'snow',
  wind: 'wind',
  other: 'other',
};

/**
 * {@link combinationsBuild} with its reasons: per rule the presence patterns formed, the patterns
 * listed once because an earlier combination has the same factors, and why a rule formed nothing.
 * @throws CombinationError as {@link combinationsBuild}
 */
export function combinationsExplain(setId: CombinationSetId, loadCases: readonly CaseRef[]): CombinationsExplained {
  const set = COMBINATION_SET_RULES[setId as CombinationSetId];
  if (!set) {
    throw new CombinationError(
      'unknown-set',
      `Combination set "${String(setId)}" is unknown; choose one of ${Object.keys(COMBINATION_SET_RULES).join(', ')}.`,
    );
  }
  assertCases(loadCases);
  const byCategory = new Map<LoadCategory, CaseRef[]>();
  for (const c of loadCases) byCategory.set(c.category, [...(byCategory.get(c.category) ?? []), c]);

  // Variable cases some rule of this set can carry (category 'other' is in no rule).
  const carried = new Set<LoadCategory>();
  for (const rule of set.rules)
    for (const group of rule.groups) if (group.kind === 'one-of') for (const o of group.options) carried.add(o.category);
  const variableIds = loadCases.filter((c) => carried.has(c.category)).map((c) => c.id);

  const result: CodeCombination[] = [];
  const rules: RuleOutcome[] = [];
  const seen = new Map<string, CodeCombination>();
  for (const rule of set.rules) {
    const outcome: RuleOutcome = { id: rule.id, clause: rule.clause, formula: rule.formula, formed: [], duplicates: [] };
    rules.push(outcome);
    const all = ruleExpand(rule, byCategory);
    const expanded = all.filter((choices) => {
      const earlier = seen.get(factorKey(choices));
      // Identical factors from an earlier rule: listed once, with this rule named there.
      if (earlier && !earlier.alsoBy.includes(rule.clause) && earlier.clause !== rule.clause) earlier.alsoBy.push(rule.clause);
      if (earlier) outcome.duplicates.push({ acting: choices.map(({ caseId, term }) => `${factorText(term.factor)} ${caseId}`).join(' + '), sameAs: earlier.name });
      return !earlier;
    });
    if (all.length === 0) outcome.notFormed = notFormedReason(rule, byCategory);
    expanded.forEach((choices, i) => {
      const factors: Record<string, number> = {};
      const factorNotes: Record<string, string> = {};
      for (const { caseId, term } of choices) {
        factors[caseId] = term.factor;
        factorNotes[caseId] = term.note;
      }
      // "ASCE 3a", or for a rule named in words "EN 6.10 leading snow (a)".
      const label = `${set.prefix} ${rule.id}${expanded.length > 1 ? (/[A-Za-z]$/.test(rule.id) ? ` (${suffix(i)})` : suffix(i)) : ''}`;
      const long = `${label}: ${actingText(choices, variableIds)}`;
      const combination: CodeCombination = {
        name: long.length <= NAME_MAX ? long : label,
        factors,
        clause: rule.clause,
        setId: set.id,
        rule: rule.id,
        formula: rule.formula,
        expression: choices.map(({ caseId, term }) => `${factorText(term.factor)} ${caseId}`).join(' + '),
        factorNotes,
        acting: choices.map((x) => x.caseId),
        notActing: variableIds.filter((id) => !choices.some((x) => x.caseId === id)),
        alsoBy: [],
      };
      seen.set(factorKey(choices), combination);
      result.push(combination);
      outcome.formed.push({ name: combination.name, expression: combination.expression });
    });
  }
  const { rules: _rules, ...info } = set;
  return { setId: set.id, title: info.title, basis: info.basis, notes: info.notes, combinations: result, rules };
}

/** Why a rule formed no combination: its leading load has no case, or only permanent actions would act. */
function notFormedReason(rule: CombinationRule, byCategory: Map<LoadCategory, CaseRef[]>): string {
  const principal = rule.groups.find((g): g is Extract<RuleGroup, { kind: 'one-of' }> => g.kind === 'one-of' && !!g.principal);
  if (principal && principal.options.every((o) => (byCategory.get(o.category) ?? []).length === 0)) {
    const led = [...new Set(principal.options.map((o) => CATEGORY_WORDS[o.category]))].join(' or ');
    return `not formed: it is led by ${led}, and no load case has that category`;
  }
  const hasDead = (byCategory.get('dead') ?? []).length > 0;
  return hasDead
    ? 'not formed: none of its variable loads has a case, so it would repeat the permanent-only combination'
    : 'not formed: none of its loads has a case';
}

/**
 * Load cases that no combination of the built-in sets uses (category 'other'), with the reason,
 * so the client can say so instead of dropping them silently.
 */
export function combinationsIgnoredCases(loadCases: readonly CaseRef[]): { caseId: string; reason: string }[] {
  assertCases(loadCases);
  return loadCases
    .filter((c) => c.category === 'other')
    .map((c) => ({
      caseId: c.id,
      reason: `Load case "${c.name ?? c.id}" has category 'other', which the built-in sets do not factor; add it to combinations by hand with the factor its standard gives.`,
    }));
}

/**
 * Σ factor × value over a combination's cases: the combined value of any quantity that adds
 * linearly (a member force in kN, an area load in kPa or psf, …), in the unit of `values`.
 * @throws CombinationError 'missing-case-value' when a factored case has no value, 'non-finite-value'
 */
export function combinationApply(combination: Pick<Combination, 'name' | 'factors'>, values: Readonly<Record<string, number>>): number {
  let total = 0;
  for (const [caseId, factor] of Object.entries(combination.factors)) {
    const value = values[caseId];
    if (value === undefined) {
      throw new CombinationError(
        'missing-case-value',
        `Combination "${combination.name}" uses load case "${caseId}", which has no value here.`,
      );
    }
    if (!Number.isFinite(value) || !Number.isFinite(factor)) {
      throw new CombinationError('non-finite-value', `Combination "${combination.name}": case "${caseId}" gives ${factor} × ${value}.`);
    }
    total += factor * value;
  }
  return total;
}
