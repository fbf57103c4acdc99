import { trussGeometrySvg } from '@shared/drawing/truss-svg';
import type { SheetSection } from './context';

/** The truss drawn with its dimensions, and the tables of joint coordinates and members. */
export const geometrySection: SheetSection<'geometry'> = {
  build({ input, model, fmt, tags, banded, memberLength }) {
    return {
      view: {
        geometry: {
          svg: banded((b) =>
            trussGeometrySvg(b.model, {
              formatLength: (m) => fmt.num(m, 'length'),
              formatForce: (kN) => fmt.qty(kN, 'force'),
              label: `Geometry of ${input.trussName}`,
            }),
          ),
          jointRows: model.joints.map((j) => ({ cells: [j.tag, fmt.num(j.x, 'length'), fmt.num(j.y, 'length')] })),
          memberRows: model.members.map((m) => ({
            cells: [m.tag, tags.joint(m.from), tags.joint(m.to), fmt.num(memberLength(m.id), 'length'), m.group ? m.group.replace('-', ' ') : '—'],
          })),
        },
      },
      contents: [{ anchor: 'geometry', title: 'Geometry' }],
    };
  },
};
