import { BUILT_UP_REFUSED } from '@shared/design/basis';
import { num } from '@shared/design/steps';
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
const kN = (v: number) => `${v < 0 ? '\u2212' : ''}${Math.abs(v).toFixed(2)}`;

/**
 * Member design pages, one per design group: the basis of the group, the governing member's
 * every step (formula, numbers, result, clause) for each sense it carries, and all the group's
 * members in a table with their governing combination and utilisation.
 */
export const designChecksSection: SheetSection<'designChecks'> = {
  build({ input, unstable }) {
    const d = input.design;
    if (!d || unstable) {
      return { view: { designChecks: { present: false, standard: '', caution: DESIGN_CAUTION, notApplied: NOT_APPLIED, error: null, groups: [] } } };
    }
    const groups: DesignGroupView[] = d.groups.map((g, i) => {
      const members = d.members.filter((m) => m.group === g.name);
      const gov = members.reduce<(typeof members)[number] | null>((a, m) => (!a || (!m.pass && a.pass) || (m.pass === a.pass && m.utilisation > a.utilisation) ? m : a), null);
      const mat = g.material;
      const basis = [
        {
          label: 'Material',
          value:
            mat.kind === 'steel'
              ? `${mat.grade ? `${mat.grade}: ` : ''}Fy = ${num(mat.Fy)} MPa, Fu = ${num(mat.Fu)} MPa, E = ${num(mat.E)} MPa${mat.source ? ` (${mat.source})` : ' (entered by the engineer)'}`
              : `Timber${mat.name ? ` ${mat.name}` : ''}: Ft′ = ${num(mat.Ft)} MPa, Fc* = ${num(mat.Fc)} MPa, E′min = ${num(mat.Emin)} MPa, E = ${num(mat.E)} MPa, c = ${num(mat.c)} (adjusted design values entered by the engineer)`,
        },
        { label: 'Section', value: `${g.section.shape}: A = ${num(g.section.A)} mm², rx = ${num(g.section.rx)} mm (in plane), ry = ${num(g.section.ry)} mm (out of plane), An = ${num(g.section.An)} mm², U = ${num(g.section.U)}` },
        {
          label: 'Lengths',
          value: `Kx = ${num(g.Kx)}, Ky = ${num(g.Ky)}; Lx ${g.Lx === null ? '= member length' : `= ${num(g.Lx)} m`}, Ly ${g.Ly === null ? '= member length' : `= ${num(g.Ly)} m (brace or purlin spacing)`}${g.curve ? `; buckling curve ${g.curve}` : ''}`,
        },
        { label: 'Members', value: `${g.selection} (${g.memberCount})` },
      ];
      const steps: TableRow[] = [];
      if (gov) {
        for (const sc of [gov.tension, gov.compression]) {
          if (!sc) continue;
          steps.push({ cells: [`${sc.sense === 'tension' ? 'Tension' : 'Compression'}: ${sc.combination}, N = ${kN(sc.force)} kN`, '', '', '', ''], cls: 'step-head' });
          for (const st of sc.steps) steps.push({ cells: [st.clause, st.title, st.formula, st.substituted, st.result] });
          for (const l of sc.limits) {
            const r = l.capacity !== undefined ? Math.abs(sc.force) / l.capacity : l.slenderness!.value / l.slenderness!.limit;
            steps.push({
              cells: [l.clause, `Ratio: ${l.title}`, l.capacity !== undefined ? '|N| / capacity' : 'slenderness / limit', l.capacity !== undefined ? `${kN(Math.abs(sc.force))} / ${num(l.capacity)}` : `${num(l.slenderness!.value, 4)} / ${l.slenderness!.limit}`, `${ratio(r)}${r <= 1 ? ' ≤ 1.0' : ' > 1.0: fails'}`],
            });
          }
        }
      }
      const rows: TableRow[] = members.map((m) => {
        const top = m.checks.reduce<(typeof m.checks)[number] | null>((a, c) => (!a || c.ratio > a.ratio ? c : a), null);
        return {
          cells: [
            m.tag,
            m.tension ? kN(m.tension.force) : '—',
            m.compression ? kN(m.compression.force) : '—',
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
      view: { designChecks: { present: true, standard: d.standardName, caution: DESIGN_CAUTION, notApplied: NOT_APPLIED, error: d.error?.message ?? null, groups } },
      contents: d.error ? [{ anchor: 'design-checks', title: 'Member design' }] : groups.map((g) => ({ anchor: g.anchor, title: g.title })),
      summary: d.error
        ? [{ label: 'Member design', value: `not checked: ${d.error.message}` }]
        : [{ label: 'Member design', value: `${d.standardName}: ${failing === 0 ? 'every member adequate' : `${failing} member${failing === 1 ? '' : 's'} FAIL${failing === 1 ? 'S' : ''}`}${worst ? `; largest utilisation ${ratio(worst.utilisation)} (${worst.tag})` : ''}` }],
    };
  },
};
void BUILT_UP_REFUSED;
