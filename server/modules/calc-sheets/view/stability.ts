import { amplificationText } from '@shared/solver/conditioning';
import { stepView } from './format';
import type { SheetSection } from './context';

/** Stability and determinacy: the count and rank step, the verdict, a mechanism's joints, symmetry. */
export const stabilitySection: SheetSection<'stability'> = {
  build({ analysis, fmt, tags, unstable }) {
    const cls = analysis.classification;
    const mechanism = cls.mechanismJoints.map((id) => tags.joint(id)).join(', ');
    const verdict =
      cls.kind === 'determinate' ? 'Stable and statically determinate' : cls.kind === 'indeterminate' ? `Stable, statically indeterminate to degree ${cls.degree}` : 'Unstable';
    return {
      view: {
        stability: {
          ...stepView(cls.step, fmt),
          verdict,
          message: cls.message,
          mechanism,
          symmetry: analysis.symmetry.note,
          conditioning: cls.conditioning?.message ?? '',
          nearMechanism: cls.conditioning?.nearMechanism ?? false,
        },
      },
      contents: [{ anchor: 'stability', title: unstable ? 'Stability and determinacy — finding' : 'Stability and determinacy' }],
      summary: unstable
        ? [
            { label: 'Finding', value: 'Unstable — no member forces are given' },
            { label: 'Joints of the mechanism', value: mechanism || '—' },
          ]
        : [
            { label: 'Stability', value: verdict },
            ...(cls.conditioning?.nearMechanism
              ? [{ label: 'Near a mechanism', value: `1 kN can raise ${amplificationText(cls.conditioning.amplification)} kN; joints ${cls.conditioning.jointTags.slice(0, 6).join(', ')}` }]
              : []),
          ],
    };
  },
};
