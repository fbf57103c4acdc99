import { reactionEnvelopeOf, type SupportReaction } from '@shared/solver';
import type { CalcSheetView, TableRow } from './types';
import type { SheetSection } from './context';

/** Supports per table of reactions by case and combination, so a table fits the page width. */
const SUPPORTS_PER_TABLE = 3;

/**
 * The bearing-design table: every support's reaction components under each load case and each
 * combination, and each component's largest and least value with the combination (or case)
 * that gives it. Uplift is said in words: the bearing must hold the truss down.
 */
export const bearingsSection: SheetSection<'bearings'> = {
  build({ model, analysis, fmt, zeroTol, tags, unstable }) {
    const envelope = reactionEnvelopeOf(analysis);
    const supports = model.supports.filter((s) => envelope.some((r) => r.joint === s.joint));
    const kindOf = new Map(model.supports.map((s) => [s.joint, s.kind === 'pin' ? 'Pin' : `Roller, reaction at ${s.angleDeg ?? 90}°`]));

    const sources: { kind: string; name: string; reactions: SupportReaction[] }[] = [
      ...analysis.cases.map((c) => ({ kind: 'Case', name: c.caseId, reactions: c.reactions })),
      ...analysis.combinations.map((c) => ({ kind: 'Combination', name: c.name, reactions: c.reactions })),
    ];
    const bySource: CalcSheetView['bearings']['bySource'] = [];
    for (let i = 0; i < supports.length; i += SUPPORTS_PER_TABLE) {
      const chunk = supports.slice(i, i + SUPPORTS_PER_TABLE);
      bySource.push({
        head: chunk.map((s) => tags.joint(s.joint)),
        rows: sources.map((s) => ({
          cells: [
            s.name,
            ...chunk.flatMap((sup) => {
              const r = s.reactions.find((x) => x.joint === sup.joint);
              return r ? [fmt.num(r.rx, 'force'), fmt.num(r.ry, 'force')] : ['—', '—'];
            }),
          ],
          ...(s.kind === 'Case' ? { cls: 'case' } : {}),
        })),
      });
    }

    const extremes: TableRow[] = envelope.flatMap((r) => [
      { cells: [r.at, kindOf.get(r.joint) ?? '', 'Rx', fmt.num(r.rxMax, 'force'), r.rxMaxCombo ?? '—', fmt.num(r.rxMin, 'force'), r.rxMinCombo ?? '—'] },
      { cells: ['', '', 'Ry', fmt.num(r.ryMax, 'force'), r.ryMaxCombo ?? '—', fmt.num(r.ryMin, 'force'), r.ryMinCombo ?? '—'], cls: r.ryMin < -zeroTol ? 'uplift' : undefined },
    ]);

    // In words, per support: uplift (hold-down) or the least downward bearing force.
    const words = envelope.map((r) =>
      r.ryMin < -zeroTol
        ? `Uplift at ${r.at}: under ${r.ryMinCombo} the support pulls down on the truss with ${fmt.qty(-r.ryMin, 'force')}; the bearing must be held down (anchor or hold-down) for it. Largest downward bearing force ${fmt.qty(r.ryMax, 'force')} under ${r.ryMaxCombo}.`
        : `No uplift at ${r.at}: it bears down under every ${analysis.combinations.length ? 'combination' : 'load case'}, from ${fmt.qty(r.ryMin, 'force')} under ${r.ryMinCombo} to ${fmt.qty(r.ryMax, 'force')} under ${r.ryMaxCombo}.`,
    );

    const lifted = envelope.filter((r) => r.ryMin < -zeroTol);
    const summary = unstable || envelope.length === 0
      ? []
      : [
          lifted.length
            ? { label: 'Uplift', value: lifted.map((r) => `${r.at}: ${fmt.qty(-r.ryMin, 'force')}, ${r.ryMinCombo}`).join('; ') }
            : { label: 'Uplift', value: 'none at any support' },
        ];
    return {
      view: {
        bearings: {
          source: analysis.combinations.length ? 'over the combinations' : 'over the load cases (no combinations were given)',
          bySource,
          extremes,
          words,
        },
      },
      contents: envelope.length ? [{ anchor: 'bearings', title: 'Reactions for bearing design' }] : [],
      summary,
    };
  },
};
