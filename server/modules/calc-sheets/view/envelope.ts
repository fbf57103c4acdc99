import { forceSenseOf } from '@shared/drawing/truss-svg';
import type { SheetSection } from './context';

/** Each member's largest tension and compression and what governs, over the combinations (or the cases). */
export const envelopeSection: SheetSection<'envelope'> = {
  build({ analysis, fmt, zeroTol, unstable }) {
    const env = analysis.envelope;
    const summary = [];
    if (!unstable && env.length) {
      const t = env.reduce((a, b) => (b.maxTension > a.maxTension ? b : a));
      const c = env.reduce((a, b) => (b.maxCompression < a.maxCompression ? b : a));
      if (t.maxTension > zeroTol) summary.push({ label: 'Largest tension', value: `${t.tag}: ${fmt.member(t.maxTension)}, ${t.maxTensionCombo}` });
      if (c.maxCompression < -zeroTol) summary.push({ label: 'Largest compression', value: `${c.tag}: ${fmt.member(c.maxCompression)}, ${c.maxCompressionCombo}` });
    }
    return {
      view: {
        envelope: {
          source: analysis.envelopeSource === 'combinations' ? 'over the combinations' : 'over the load cases (no combinations were given)',
          rows: env.map((r) => ({
            cells: [
              r.tag,
              r.maxTension > zeroTol ? fmt.num(r.maxTension, 'force', true) : '—',
              r.maxTensionCombo && r.maxTension > zeroTol ? r.maxTensionCombo : '',
              r.maxCompression < -zeroTol ? fmt.num(r.maxCompression, 'force') : '—',
              r.maxCompressionCombo && r.maxCompression < -zeroTol ? r.maxCompressionCombo : '',
              forceSenseOf(r.governingForce, zeroTol) === '0' ? fmt.memberNum(0) : `${fmt.memberNum(r.governingForce)} ${fmt.sense(r.governingForce)}`,
              r.governing ?? '—',
            ],
          })),
        },
      },
      summary,
    };
  },
};
