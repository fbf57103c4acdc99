import type { LoadCategory } from '@shared/model/truss';

/**
 * The built-in combination sets as data. Each rule lists groups of terms; a group either takes
 * every case of its category together (permanent actions) or one case from its options (the
 * "or" of the standard, and one case at a time of a variable category).
 *
 * Sources (recommended values; a project's National Annex or adopted edition may differ):
 * - ASCE/SEI 7-16 §2.3.1 basic strength combinations (1)–(5) and §2.4.1 allowable-stress
 *   combinations (1)–(7) (from memory, high confidence). Seismic combinations (§2.3.1 (6)–(7),
 *   §2.4.1 (8)–(10)) are left out: Panelpoint has no seismic load category. Rain R and flood,
 *   ice and self-straining loads are not load categories either.
 * - EN 1990:2002+A1:2005 eq. (6.10), (6.10a), (6.10b) with Table A1.2(B) recommended partial
 *   factors γ_G,sup = 1.35, γ_G,inf = 1.00, γ_Q = 1.50, ξ = 0.85, and Table A1.1 ψ0 factors
 *   (from memory): imposed load categories A/B 0.7, roofs (category H) 0, snow at sites
 *   ≤ 1000 m a.s.l. 0.5, wind 0.6.
 */

/** Ids of the built-in sets. */
export type CombinationSetId = 'asce7-16-strength' | 'asce7-16-asd' | 'en1990-6.10' | 'en1990-6.10ab';

type OneOfGroup = Extract<RuleGroup, { kind: 'one-of' }>;

/** What the client lists when the engineer picks a set. */
export interface CombinationSetInfo {
  id: CombinationSetId;
  title: string;
  /** The standard and clause the whole set comes from. */
  basis: string;
  /** Prefix of the combination names, e.g. "LRFD". */
  prefix: string;
  /** What the set leaves out or assumes, in words for the calc sheet. */
  notes: string[];
}

/** A factor on the cases of one category, with where it comes from. */
export interface RuleTerm {
  category: LoadCategory;
  factor: number;
  /** Why this factor, e.g. "1.6 on snow, principal roof load". */
  note: string;
}

/** A group of terms in a rule. */
export type RuleGroup =
  /**
   * Every case of the category, all with the same factor (permanent actions act together).
   * With `favourable`, the rule is also formed with that factor on the whole permanent action
   * (EN 1990 Table A1.2(B): γ_G,inf = 1.00 where the permanent action is favourable).
   */
  | { kind: 'all'; term: RuleTerm; favourable?: RuleTerm }
  /**
   * One case out of all cases of the listed categories, or none of them: a variable action may
   * always be left out where it is favourable (ASCE/SEI 7-16 §2.3.1 and §2.4.1, "the effects of
   * one or more loads not acting"; EN 1990 Table A1.2(B), γ_Q = 0 where favourable).
   * `principal`: the load that names the rule (1.6 on snow in 1.2D + 1.6S, the leading action of
   * EN 6.10); the rule is not formed without it.
   */
  | { kind: 'one-of'; options: RuleTerm[]; principal?: boolean };

export interface CombinationRule {
  /** Short id within the set, e.g. "3" or "6.10b leading snow". */
  id: string;
  /** E.g. "ASCE/SEI 7-16 §2.3.1 (3)". */
  clause: string;
  /** The combination as the standard writes it, e.g. "1.2D + 1.6(Lr or S or R) + (L or 0.5W)". */
  formula: string;
  groups: RuleGroup[];
  /**
   * 'always': the rule stands with permanent actions alone (e.g. 1.4D).
   * 'variable': the rule is skipped when none of its variable categories has a case.
   */
  needs: 'always' | 'variable';
}

export interface CombinationSet extends CombinationSetInfo {
  rules: CombinationRule[];
}

const ASCE_ABSENT_NOTE =
  'Each variable load is also left out in turn ("the effects of one or more loads not acting", ASCE/SEI 7-16 §2.3.1 and §2.4.1), so a load that relieves a member (wind uplift against snow) cannot lower the envelope; the load that names a combination (1.6 in 1.2D + 1.6S) is always present.';

const ASCE_SEISMIC_NOTE =
  'Seismic combinations are not included: Panelpoint has no seismic load category. Rain (R) has no category either; where the standard says "Lr or S or R" the roof live and snow cases are the alternatives.';

function asceStrength(): CombinationSet {
  const c = (n: number) => `ASCE/SEI 7-16 §2.3.1 (${n})`;
  const t = (category: LoadCategory, factor: number, rule: number, why: string): RuleTerm => ({
    category,
    factor,
    note: `${factor} ${why}: ${c(rule)}`,
  });
  const roof = (factor: number, rule: number, why: string): OneOfGroup => ({
    kind: 'one-of',
    options: [t('roof-live', factor, rule, `on roof live load (Lr) ${why}`), t('snow', factor, rule, `on snow (S) ${why}`)],
  });
  const liveNote =
    'on live load (L); the §2.3.1 exception allowing 0.5 where L_o ≤ 100 psf (not garages or places of public assembly) is not applied';
  return {
    id: 'asce7-16-strength',
    title: 'ASCE/SEI 7-16 strength design (LRFD), basic combinations',
    basis: 'ASCE/SEI 7-16 §2.3.1, combinations (1) to (5)',
    prefix: 'LRFD',
    notes: [ASCE_ABSENT_NOTE, ASCE_SEISMIC_NOTE, `The factor on L in (3) and (4) is 1.0; ${c(3)} exception 1 (0.5L) is not applied.`],
    rules: [
      {
        id: '1',
        clause: c(1),
        formula: '1.4D',
        needs: 'always',
        groups: [{ kind: 'all', term: t('dead', 1.4, 1, 'on dead load (D)') }],
      },
      {
        id: '2',
        clause: c(2),
        formula: '1.2D + 1.6L + 0.5(Lr or S or R)',
        needs: 'variable',
        groups: [
          { kind: 'all', term: t('dead', 1.2, 2, 'on dead load (D)') },
          { kind: 'one-of', principal: true, options: [t('live', 1.6, 2, 'on live load (L), principal')] },
          roof(0.5, 2, 'as companion load'),
        ],
      },
      {
        id: '3',
        clause: c(3),
        formula: '1.2D + 1.6(Lr or S or R) + (L or 0.5W)',
        needs: 'variable',
        groups: [
          { kind: 'all', term: t('dead', 1.2, 3, 'on dead load (D)') },
          { ...roof(1.6, 3, 'as principal roof load'), principal: true },
          { kind: 'one-of', options: [t('live', 1.0, 3, liveNote), t('wind', 0.5, 3, 'on wind (W) as companion load')] },
        ],
      },
      {
        id: '4',
        clause: c(4),
        formula: '1.2D + 1.0W + L + 0.5(Lr or S or R)',
        needs: 'variable',
        groups: [
          { kind: 'all', term: t('dead', 1.2, 4, 'on dead load (D)') },
          { kind: 'one-of', principal: true, options: [t('wind', 1.0, 4, 'on wind (W), principal')] },
          { kind: 'one-of', options: [t('live', 1.0, 4, liveNote)] },
          roof(0.5, 4, 'as companion load'),
        ],
      },
      {
        id: '5',
        clause: c(5),
        formula: '0.9D + 1.0W',
        needs: 'variable',
        groups: [
          { kind: 'all', term: t('dead', 0.9, 5, 'on dead load (D), counteracting wind') },
          { kind: 'one-of', principal: true, options: [t('wind', 1.0, 5, 'on wind (W)')] },
        ],
      },
    ],
  };
}

function asceAllowable(): CombinationSet {
  const c = (n: number) => `ASCE/SEI 7-16 §2.4.1 (${n})`;
  const t = (category: LoadCategory, factor: number, rule: number, why: string): RuleTerm => ({
    category,
    factor,
    note: `${why}: ${c(rule)}`,
  });
  const roof = (factor: number, rule: number, why: string): OneOfGroup => ({
    kind: 'one-of',
    options: [
      t('roof-live', factor, rule, `${why} on roof live load (Lr)`),
      t('snow', factor, rule, `${why} on snow (S)`),
    ],
  });
  const D = (factor: number, rule: number): RuleGroup => ({ kind: 'all', term: t('dead', factor, rule, `${factor} on dead load (D)`) });
  return {
    id: 'asce7-16-asd',
    title: 'ASCE/SEI 7-16 allowable stress design (ASD), basic combinations',
    basis: 'ASCE/SEI 7-16 §2.4.1, combinations (1) to (7)',
    prefix: 'ASD',
    notes: [ASCE_ABSENT_NOTE, ASCE_SEISMIC_NOTE],
    rules: [
      { id: '1', clause: c(1), formula: 'D', needs: 'always', groups: [D(1.0, 1)] },
      {
        id: '2',
        clause: c(2),
        formula: 'D + L',
        needs: 'variable',
        groups: [D(1.0, 2), { kind: 'one-of', principal: true, options: [t('live', 1.0, 2, '1.0 on live load (L)')] }],
      },
      { id: '3', clause: c(3), formula: 'D + (Lr or S or R)', needs: 'variable', groups: [D(1.0, 3), { ...roof(1.0, 3, '1.0'), principal: true }] },
      {
        id: '4',
        clause: c(4),
        formula: 'D + 0.75L + 0.75(Lr or S or R)',
        needs: 'variable',
        groups: [D(1.0, 4), { kind: 'one-of', options: [t('live', 0.75, 4, '0.75 on live load (L)')] }, roof(0.75, 4, '0.75')],
      },
      {
        id: '5',
        clause: c(5),
        formula: 'D + 0.6W',
        needs: 'variable',
        groups: [D(1.0, 5), { kind: 'one-of', principal: true, options: [t('wind', 0.6, 5, '0.6 on wind (W)')] }],
      },
      {
        id: '6',
        clause: c(6),
        formula: 'D + 0.75L + 0.75(0.6W) + 0.75(Lr or S or R)',
        needs: 'variable',
        groups: [
          D(1.0, 6),
          { kind: 'one-of', options: [t('live', 0.75, 6, '0.75 on live load (L)')] },
          { kind: 'one-of', options: [t('wind', 0.45, 6, '0.75 × 0.6 = 0.45 on wind (W)')] },
          roof(0.75, 6, '0.75'),
        ],
      },
      {
        id: '7',
        clause: c(7),
        formula: '0.6D + 0.6W',
        needs: 'variable',
        groups: [D(0.6, 7), { kind: 'one-of', principal: true, options: [t('wind', 0.6, 7, '0.6 on wind (W)')] }],
      },
    ],
  };
}

/** EN 1990 Table A1.2(B) recommended values. */
const GAMMA_G_SUP = 1.35;
const GAMMA_G_INF = 1.0;
const GAMMA_Q = 1.5;
const XI = 0.85;

/** EN 1990 Table A1.1 ψ0 per category (recommended values, from memory). */
/** `word`: the leading action in plain words for the rule's name ("6.10 leading snow"). */
const PSI0: Record<Exclude<LoadCategory, 'dead' | 'other'>, { psi0: number; why: string; symbol: string; word: string }> = {
  live: { psi0: 0.7, why: 'imposed load, categories A/B assumed', symbol: 'Q', word: 'imposed' },
  'roof-live': { psi0: 0, why: 'imposed load on roofs, category H', symbol: 'H', word: 'roof imposed' },
  snow: { psi0: 0.5, why: 'snow, site altitude ≤ 1000 m a.s.l.', symbol: 'S', word: 'snow' },
  wind: { psi0: 0.6, why: 'wind', symbol: 'W', word: 'wind' },
};
const VARIABLE: Array<keyof typeof PSI0> = ['live', 'roof-live', 'snow', 'wind'];

const round = (x: number) => Math.round(x * 1e10) / 1e10;

/** EN 1991-1-1 §3.3.2(1): roof imposed load is not applied together with snow or wind. */
const H_EXCLUSION_CLAUSE = 'EN 1991-1-1:2002 §3.3.2(1)';

function enSet(id: 'en1990-6.10' | 'en1990-6.10ab'): CombinationSet {
  const table = 'EN 1990:2002+A1 Table A1.2(B)';
  const clause = (eq: string) => `EN 1990:2002+A1 eq. (${eq}), Table A1.2(B), Table A1.1`;
  const favourable = (eq: string): RuleTerm => ({
    category: 'dead',
    factor: GAMMA_G_INF,
    note: `γ_G,inf = ${GAMMA_G_INF.toFixed(2)} on the whole permanent action (G), favourable: EN 1990 eq. (${eq}), ${table}`,
  });
  const permanent = (eq: string, xi: boolean): RuleGroup => ({
    kind: 'all',
    term: xi
      ? {
          category: 'dead',
          factor: round(XI * GAMMA_G_SUP),
          note: `ξ·γ_G,sup = ${XI} × ${GAMMA_G_SUP} = ${round(XI * GAMMA_G_SUP)} on permanent actions (G), unfavourable: EN 1990 eq. (${eq}), ${table}`,
        }
      : {
          category: 'dead',
          factor: GAMMA_G_SUP,
          note: `γ_G,sup = ${GAMMA_G_SUP} on permanent actions (G), unfavourable: EN 1990 eq. (${eq}), ${table}`,
        },
    favourable: favourable(eq),
  });
  const leading = (category: keyof typeof PSI0, eq: string): RuleGroup => ({
    kind: 'one-of',
    principal: true,
    options: [
      {
        category,
        factor: GAMMA_Q,
        note: `γ_Q = ${GAMMA_Q} on ${PSI0[category].why} (${PSI0[category].symbol}), leading: EN 1990 eq. (${eq}), ${table}`,
      },
    ],
  });
  const accompanying = (category: keyof typeof PSI0, eq: string): RuleGroup[] => {
    const { psi0, why, symbol } = PSI0[category];
    // ψ0 = 0 (roofs, category H) gives a zero factor: the action does not accompany.
    if (psi0 === 0) return [];
    return [
      {
        kind: 'one-of',
        options: [
          {
            category,
            factor: round(GAMMA_Q * psi0),
            note: `γ_Q·ψ0 = ${GAMMA_Q} × ${psi0} = ${round(GAMMA_Q * psi0)} on ${why} (${symbol}), ${eq === '6.10a' ? 'every variable action with ψ0' : 'accompanying'}: EN 1990 eq. (${eq}), ${table}; ψ0 from Table A1.1`,
          },
        ],
      },
    ];
  };
  /** Who may accompany a leading action: nothing goes with roof imposed load but other imposed load. */
  const companions = (lead: keyof typeof PSI0) =>
    VARIABLE.filter((other) => other !== lead).filter(
      (other) => !(lead === 'roof-live' && (other === 'snow' || other === 'wind')),
    );
  const leadingRules = (eq: string, xi: boolean): CombinationRule[] =>
    VARIABLE.map((lead) => ({
      id: `${eq} leading ${PSI0[lead].word}`,
      clause: lead === 'roof-live' ? `${clause(eq)}; ${H_EXCLUSION_CLAUSE}` : clause(eq),
      formula: xi
        ? `ξγ_G G + γ_Q ${PSI0[lead].symbol} + Σ γ_Q ψ0 Q_i`
        : `γ_G G + γ_Q ${PSI0[lead].symbol} + Σ γ_Q ψ0 Q_i`,
      needs: 'variable' as const,
      groups: [permanent(eq, xi), leading(lead, eq), ...companions(lead).flatMap((other) => accompanying(other, eq))],
    }));

  const notes = [
    'Recommended values of EN 1990:2002+A1 Annex A1; a National Annex may set other γ, ξ and ψ0 values or choose between (6.10) and (6.10a)/(6.10b).',
    'ψ0 (Table A1.1): imposed load 0.7 (categories A/B assumed), roofs (H) 0, snow 0.5 (site ≤ 1000 m a.s.l.), wind 0.6.',
    'Each variable action is also left out in turn (γ_Q = 0 where favourable, Table A1.2(B)), and each combination is formed with γ_G,sup and with γ_G,inf = 1.00 on the whole permanent action.',
    `Roof imposed load (category H) is not combined with snow or wind (${H_EXCLUSION_CLAUSE}). Adding them would not be "on the safe side" here: wind suction lifts the roof and would reduce the effect of the imposed load.`,
    'Each variable case leads in turn; cases of the same category are alternatives. A category with no case leads no combination.',
  ];
  if (id === 'en1990-6.10') {
    return {
      id,
      title: 'EN 1990 fundamental combination, eq. (6.10)',
      basis: 'EN 1990:2002+A1 §6.4.3.2 eq. (6.10), Table A1.2(B)',
      prefix: 'EN',
      notes,
      rules: [
        {
          id: '6.10 G',
          clause: clause('6.10'),
          formula: 'γ_G G',
          needs: 'always',
          groups: [permanent('6.10', false)],
        },
        ...leadingRules('6.10', false),
      ],
    };
  }
  return {
    id,
    title: 'EN 1990 fundamental combination, eq. (6.10a) and (6.10b)',
    basis: 'EN 1990:2002+A1 §6.4.3.2 eq. (6.10a) and (6.10b), Table A1.2(B)',
    prefix: 'EN',
    notes: [...notes, 'The design value is the less favourable of (6.10a) and (6.10b).'],
    rules: [
      {
        id: '6.10a',
        clause: clause('6.10a'),
        formula: 'γ_G G + Σ γ_Q ψ0 Q_i',
        needs: 'always',
        groups: [permanent('6.10a', false), ...VARIABLE.flatMap((category) => accompanying(category, '6.10a'))],
      },
      ...leadingRules('6.10b', true),
    ],
  };
}

/** The built-in sets with their rules. */
export const COMBINATION_SET_RULES: Readonly<Record<CombinationSetId, CombinationSet>> = {
  'asce7-16-strength': asceStrength(),
  'asce7-16-asd': asceAllowable(),
  'en1990-6.10': enSet('en1990-6.10'),
  'en1990-6.10ab': enSet('en1990-6.10ab'),
};

/** Ids, titles and notes of the built-in sets, for the picker. */
export const COMBINATION_SETS: readonly CombinationSetInfo[] = Object.values(COMBINATION_SET_RULES).map(
  ({ rules: _rules, ...info }) => info,
);
