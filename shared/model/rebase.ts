import type { Joint, Member, TrussModel } from './truss';

export interface RebaseResult {
  model: TrussModel;
  /** What could not be carried over because no joint or member stands there any more. */
  dropped: { supports: string[]; loads: string[]; memberProperties: string[] };
}

/**
 * Puts an existing model's supports, loads and member properties onto new geometry (a
 * re-imported drawing), matching joints by position within `tolerance` (m) and members by
 * their two end positions. Ids change with every import; positions are what the engineer
 * placed things on.
 */
export function modelRebase(
  previous: TrussModel | null,
  geometry: { joints: Joint[]; members: Member[] },
  tolerance: number,
): RebaseResult {
  const joints = geometry.joints.map(({ id, tag, x, y }) => ({ id, tag, x, y }));
  // The group a drawing suggests (from its layer names or outline) comes along; a group the
  // engineer set on the previous model wins over it below.
  const members: Member[] = geometry.members.map(({ id, tag, from, to, group }) => ({ id, tag, from, to, ...(group ? { group } : {}) }));
  const dropped: RebaseResult['dropped'] = { supports: [], loads: [], memberProperties: [] };
  if (!previous) {
    return { model: { joints, members, supports: [], loadCases: [], combinations: [] }, dropped };
  }

  const cell = Math.max(tolerance, 1e-9);
  const key = (x: number, y: number) => `${Math.round(x / cell)},${Math.round(y / cell)}`;
  const grid = new Map<string, Joint[]>();
  for (const j of joints) {
    const k = key(j.x, j.y);
    grid.set(k, [...(grid.get(k) ?? []), j]);
  }
  const jointNear = (x: number, y: number): Joint | undefined => {
    const cx = Math.round(x / cell);
    const cy = Math.round(y / cell);
    let best: Joint | undefined;
    let bestD = Infinity;
    for (let dx = -1; dx <= 1; dx++) {
      for (let dy = -1; dy <= 1; dy++) {
        for (const j of grid.get(`${cx + dx},${cy + dy}`) ?? []) {
          const d = Math.hypot(j.x - x, j.y - y);
          if (d <= tolerance && d < bestD) {
            best = j;
            bestD = d;
          }
        }
      }
    }
    return best;
  };

  const oldJoints = new Map(previous.joints.map((j) => [j.id, j]));
  const mapJoint = (oldId: string): string | undefined => {
    const old = oldJoints.get(oldId);
    return old ? jointNear(old.x, old.y)?.id : undefined;
  };

  const supports = previous.supports.flatMap((s) => {
    const joint = mapJoint(s.joint);
    if (!joint) {
      dropped.supports.push(oldJoints.get(s.joint)?.tag ?? s.joint);
      return [];
    }
    return [{ ...s, joint }];
  });
  const loadCases = previous.loadCases.map((lc) => ({
    ...lc,
    loads: lc.loads.flatMap((l) => {
      const joint = mapJoint(l.joint);
      if (!joint) {
        dropped.loads.push(`${lc.id} at ${oldJoints.get(l.joint)?.tag ?? l.joint}`);
        return [];
      }
      return [{ ...l, joint }];
    }),
  }));

  const byEnds = new Map<string, Member>();
  for (const m of members) byEnds.set([m.from, m.to].sort().join('|'), m);
  const memberMap = new Map<string, string>();
  for (const old of previous.members) {
    const a = mapJoint(old.from);
    const b = mapJoint(old.to);
    const target = a && b ? byEnds.get([a, b].sort().join('|')) : undefined;
    if (target) memberMap.set(old.id, target.id);
  }
  for (const old of previous.members) {
    const { E, A, EA, group, material, section } = old;
    if ([E, A, EA, group, material, section].every((v) => v === undefined)) continue;
    const a = mapJoint(old.from);
    const b = mapJoint(old.to);
    const target = a && b ? byEnds.get([a, b].sort().join('|')) : undefined;
    if (!target) {
      dropped.memberProperties.push(old.tag);
      continue;
    }
    Object.assign(target, Object.fromEntries(Object.entries({ E, A, EA, group, material, section }).filter(([, v]) => v !== undefined)));
  }

  // Member design follows the members it names; a group left with none of its members goes.
  let design = previous.design;
  if (design) {
    const groups = design.groups.flatMap((g) => {
      if (!Array.isArray(g.members)) return [g];
      const ids = g.members.flatMap((id) => memberMap.get(id) ?? []);
      return ids.length ? [{ ...g, members: ids }] : [];
    });
    const deflJoints = design.deflection?.joints.flatMap((j) => mapJoint(j) ?? []) ?? [];
    const { deflection, ...rest } = design;
    design = groups.length ? { ...rest, groups, ...(deflection && deflJoints.length ? { deflection: { ...deflection, joints: deflJoints } } : {}) } : undefined;
  }
  return {
    model: { joints, members, supports, loadCases, combinations: previous.combinations, ...(design ? { design } : {}) },
    dropped,
  };
}
