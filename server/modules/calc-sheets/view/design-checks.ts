import { BUILT_UP_REFUSED, memberStepsIn } from '@shared/design/basis';
import { designSymbols } from '@shared/design/symbols';
import { carriedStep, num } from '@shared/design/steps';
import { areaOut, DESIGN_UNITS, forceOut, lengthOut, spanOut, stressOut, type DesignUnitSet } from '@shared/design/units';
import type { SheetSection } from './context';
import type { DesignGroupView, TableRow } from './types';

/** Printed on every sheet with member design (and on the design pages). */
export const DESIGN_CAUTION =
  'The design values (material strengths, section properties, effective lengths), the edition of the standard and any National Annex or local amendment must be verified by the engineer of record before this sheet is relied on.';

/** What the checks do not cover, said on the sheet (the conservative reading is taken where a rule is left out). */
export const NOT_APPLIED = [
  'Axial checks only: members are taken as pin-ended and loaded at the joints, so bending, combined forces, connections and local effects are outside these pages.',
  'Built-up members: AISC 360-16 §E6 and EN 1993-1-1 §6.4 are not applied; a pair of angles in compression is reported as not checked (failing), never checked on the unsafe side.',
  'Slender elements (AISC 360-16 §E7, EN 1993-1-1 class 4) and torsional or flexural-torsional buckling (AISC 360-16 §E4, EN 1993-1-1 §6.3.1.4) are not checked; sections are taken as nonslender, class 1 to 3.',
  'Recommended slenderness limits (AISC 360-16 D1 ≤ 300 for tension, E2 ≤ 200 for compression; NDS 2018 3.7.1.4 ℓe/d ≤ 50) are held as limits: a member beyond one fails with the limit written.',
];

const ratio = (r: number) => num(r, 3);
/** A force (kN) in the sheet's force unit, two decimals, true minus sign. */
const force = (kN: number, u: DesignUnitSet) => {
  const v = forceOut(kN, u);
  return `${v < 0 && Math.abs(v) >= 0.005 ? '\u2212' : ''}${Math.abs(v).toFixed(2)}`;
};

/** The units line of the design pages: what the steps are worked in on this project. */
export function designUnitsLine(u: DesignUnitSet): string {
  return u.system === 'us'
    ? 'Forces in kip, lengths and radii of gyration in in, areas in in², stresses in ksi: each step is worked in these units, from the design values converted with the exact inch and pound-force (NIST SP 811), so its printed numbers multiply out.'
    : 'Forces in kN, lengths and radii of gyration in mm, areas in mm², stresses in MPa, as the standards’ formulas are written.';
}

/**
 * Member design pages, one per design group: the basis of the group, the governing member's
 * every step (formula, numbers, result, clause) for each sense it carries, and all the group's
 * members in a table with their governing combination and utilisation.
 */
export const designChecksSection: SheetSection<'designChecks'> = {
  build({ input, unstable, system, model }) {
    const d = input.design;
    const u = DESIGN_UNITS[system];
    const units = { force: u.force, line: designUnitsLine(u) };
    if (!d || unstable) {
      return { view: { designChecks: { present: false, standard: '', caution: DESIGN_CAUTION, notApplied: NOT_APPLIED, symbols: [], error: null, groups: [], units } } };
    }
    const S = (mpa: number) => `${num(stressOut(mpa, u))} ${u.stress}`;
    const groups: DesignGroupView[] = d.groups.map((g, i) => {
      const members = d.members.filter((m) => m.group === g.name);
      const gov = members.reduce<(typeof members)[number] | null>((a, m) => (!a || (!m.pass && a.pass) || (m.pass === a.pass && m.utilisation > a.utilisation) ? m : a), null);
      const mat = g.material;
      const basis = [
        {
          label: 'Material',
          value:
            mat.kind === 'steel'
              ? `${mat.grade ? `${mat.grade}: ` : ''}Fy = ${S(mat.Fy)}, Fu = ${S(mat.Fu)}, E = ${S(mat.E)}${mat.source ? ` (${mat.source})` : ' (entered by the engineer)'}`
              : `Timber${mat.name ? ` ${mat.name}` : ''}: Ft′ = ${S(mat.Ft)}, Fc* = ${S(mat.Fc)}, E′min = ${S(mat.Emin)}, E = ${S(mat.E)}, c = ${num(mat.c)} (adjusted design values entered by the engineer)`,
        },
        {
          label: 'Section',
          value: `${g.section.shape}: A = ${num(areaOut(g.section.A, u))} ${u.area}, rx = ${num(lengthOut(g.section.rx, u))} ${u.length} (in plane), ry = ${num(lengthOut(g.section.ry, u))} ${u.length} (out of plane), An = ${num(areaOut(g.section.An, u))} ${u.area}, U = ${num(g.section.U)}`,
        },
        {
          label: 'Lengths',
          value: `Kx = ${num(g.Kx)}, Ky = ${num(g.Ky)}; Lx ${g.Lx === null ? '= member length' : `= ${num(spanOut(g.Lx, u))} ${u.span}`}, Ly ${g.Ly === null ? '= member length' : `= ${num(spanOut(g.Ly, u))} ${u.span} (brace or purlin spacing)`}${g.curve ? `; buckling curve ${g.curve}` : ''}`,
        },
        { label: 'Members', value: `${g.selection} (${g.memberCount})` },
      ];
      const steps: TableRow[] = [];
      if (gov) {
        const shown = memberStepsIn(model, d, gov, u);
        for (const sc of [shown.tension, shown.compression]) {
          if (!sc) continue;
          steps.push({ cells: [`${sc.sense === 'tension' ? 'Tension' : 'Compression'}: ${sc.combination}, N = ${force(sc.force, u)} ${u.force}`, '', '', '', ''], cls: 'step-head' });
          for (const st of sc.steps) steps.push({ cells: [st.clause, st.title, st.formula, st.substituted, st.result] });
          for (const l of sc.limits) {
            const r = l.capacity !== undefined ? Math.abs(sc.force) / l.capacity : l.slenderness!.value / l.slenderness!.limit;
            const verdict = `${r <= 1 ? ' ≤ 1.0' : ' > 1.0: fails'}`;
            // |N| and the capacity printed with the figures that make the ratio multiply out.
            const line =
              l.capacity !== undefined
                ? carriedStep({ clause: l.clause, title: `Ratio: ${l.title}`, formula: '|N| / capacity', ops: [Math.abs(forceOut(sc.force, u)), forceOut(l.capacity, u)], text: ([n, c]) => `${n} ${u.force} / ${c} ${u.force}`, redo: ([n, c]) => n / c, value: r, sig: 3 })
                : carriedStep({ clause: l.clause, title: `Ratio: ${l.title}`, formula: 'slenderness / limit', ops: [l.slenderness!.value], text: ([s]) => `${s} / ${l.slenderness!.limit}`, redo: ([s]) => s / l.slenderness!.limit, value: r, sig: 3 });
            steps.push({ cells: [line.clause, line.title, line.formula, line.substituted, `${line.result}${verdict}`] });
          }
        }
      }
      const rows: TableRow[] = members.map((m) => {
        const top = m.checks.reduce<(typeof m.checks)[number] | null>((a, c) => (!a || c.ratio > a.ratio ? c : a), null);
        return {
          cells: [
            m.tag,
            m.tension ? force(m.tension.force, u) : '—',
            m.compression ? force(m.compression.force, u) : '—',
            m.governing ?? '—',
            m.refused ? 'E6 / 6.4 not applied' : top ? `${top.clause}` : '—',
            m.refused ? 'not checked' : ratio(m.utilisation),
            m.refused ? 'NOT CHECKED' : m.pass ? (m.reversal ? 'OK (reversal)' : 'OK') : 'FAILS',
          ],
          cls: m.pass ? undefined : 'is-bad',
        };
      });
      return {
        anchor: `design-${i + 1}`,
        title: `Member design: ${g.name}`,
        basis,
        governing: gov
          ? {
              tag: gov.tag,
              line: `Governing member ${gov.tag}${gov.governing ? ` under ${gov.governing}` : ''}: utilisation ${ratio(gov.utilisation)}${gov.refused ? ', not checked' : gov.pass ? ' ≤ 1.0, adequate' : ' > 1.0, FAILS'}.`,
              steps,
              notes: gov.notes,
              ...(gov.refused ? { refused: gov.refused } : {}),
            }
          : null,
        rows,
      };
    });
    const failing = d.members.filter((m) => !m.pass).length;
    const worst = d.members.reduce<(typeof d.members)[number] | null>((a, m) => (!a || m.utilisation > a.utilisation ? m : a), null);
    return {
      view: { designChecks: { present: true, standard: d.standardName, caution: DESIGN_CAUTION, notApplied: NOT_APPLIED, symbols: designSymbols(d.standard), error: d.error?.message ?? null, groups, units } },
      contents: d.error ? [{ anchor: 'design-checks', title: 'Member design' }] : groups.map((g) => ({ anchor: g.anchor, title: g.title })),
      summary: d.error
        ? [{ label: 'Member design', value: `not checked: ${d.error.message}` }]
        : [{ label: 'Member design', value: `${d.standardName}: ${failing === 0 ? 'every member adequate' : `${failing} member${failing === 1 ? '' : 's'} FAIL${failing === 1 ? 'S' : ''}`}${worst ? `; largest utilisation ${ratio(worst.utilisation)} (${worst.tag})` : ''}` }],
    };
  },
};
void BUILT_UP_REFUSED;
