import { useState } from 'react';
import type { DeflectedShape } from '@shared/design/deflected-shape';
import { SHAPE_JOINT_LIMIT } from '@shared/design/deflected-shape';
import type { TrussModel } from '@shared/model/truss';
import { DESIGN_UNITS, lengthOut } from '@shared/design/units';
import type { UnitSystemId } from '@shared/units';
import { TrussSvg } from './truss-svg';

const SELECT = 'h-8 rounded-xs border border-paper-line bg-paper-raised px-2 text-[13px]';

/**
 * The deflected shape of a run, exaggerated with its scale written: the displaced truss in ink,
 * the truss as drawn dashed under it, the joint that moves most named. `shapes` null: too many
 * joints to draw; undefined: a run made before shapes were worked out.
 */
export function DeflectedShapeView({ model, shapes, unitSystem = 'si' }: { model: TrussModel; shapes: DeflectedShape[] | null | undefined; unitSystem?: UnitSystemId }) {
  const u = DESIGN_UNITS[unitSystem];
  const [pick, setPick] = useState(0);
  if (shapes === null) return <p className="text-xs text-ink-faint">The deflected shape is not drawn for a truss of more than {SHAPE_JOINT_LIMIT} joints; the deflections above are complete.</p>;
  if (shapes === undefined) return <p className="text-xs text-ink-faint">This run was made before deflected shapes were drawn; run the truss again to see it.</p>;
  if (shapes.length === 0) return null;
  const shape = shapes[Math.min(pick, shapes.length - 1)];
  const moved = new Map(shape.joints.map((d) => [d.joint, d]));
  const displaced = model.joints.map((j) => {
    const d = moved.get(j.id);
    return { ...j, x: j.x + (shape.scale * (d?.ux ?? 0)) / 1000, y: j.y + (shape.scale * (d?.uy ?? 0)) / 1000 };
  });
  const original = new Map(model.joints.map((j) => [j.id, j]));
  return (
    <div className="mt-4">
      <div className="mb-2 flex flex-wrap items-center gap-3">
        <h3 className="text-sm font-semibold text-ink">Deflected shape</h3>
        {shapes.length > 1 && (
          <label className="flex items-center gap-2 text-sm text-ink-soft">
            under
            <select aria-label="Deflected shape combination" className={SELECT} value={pick} onChange={(e) => setPick(Number(e.target.value))}>
              {shapes.map((s, i) => (
                <option key={s.combination} value={i}>
                  {s.combination}
                </option>
              ))}
            </select>
          </label>
        )}
      </div>
      <TrussSvg
        label={`Deflected shape under ${shape.combination}`}
        height={300}
        joints={displaced}
        members={model.members}
        supports={[]}
        memberLook={() => ({ colour: '#2b2d2f', width: 2 })}
        highlightJoints={new Set(model.joints.filter((j) => j.tag === shape.maxTag).map((j) => j.id))}
        overlay={(fit, size) => (
          <svg width={size.width} height={size.height} className="pointer-events-none absolute inset-0" aria-hidden>
            {model.members.map((m) => {
              const a = original.get(m.from);
              const b = original.get(m.to);
              if (!a || !b) return null;
              const p = fit.toScreen(a);
              const q = fit.toScreen(b);
              return <line key={m.id} x1={p.x} y1={p.y} x2={q.x} y2={q.y} stroke="#8b9197" strokeWidth={1} strokeDasharray="5 4" />;
            })}
          </svg>
        )}
      />
      <p className="mt-1 text-xs text-ink-soft" data-testid="shape-caption">
        Under {shape.combination}: movements drawn {shape.scale > 1 ? `${shape.scale} × their size` : 'true to size'}; the truss as drawn is dashed. Largest movement {lengthOut(shape.maxMm, u).toFixed(unitSystem === 'us' ? 3 : 2)} {u.length} at {shape.maxTag} (direct stiffness method, same A and E as the table).
      </p>
    </div>
  );
}
