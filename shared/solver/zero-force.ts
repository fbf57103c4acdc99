import type { PreparedCase, PreparedModel } from './prepare';
import { stepIdPart } from './step-id';
import type { ZeroForceFinding } from './types';

/** |sin| of the angle between two members below which they count as collinear. */
export const COLLINEAR_TOLERANCE = 1e-9;

/**
 * Zero-force members by the two joint rules (textbook method of joints):
 * rule 1, an unloaded, unsupported joint with two non-collinear members: both carry zero;
 * rule 2, an unloaded, unsupported joint with three members, two of them collinear: the third
 * carries zero. Members found in one pass are removed before the next; passes repeat until
 * nothing changes. Loads decide which joints qualify, so this runs per load case.
 */
export function zeroForceFind(pm: PreparedModel, lc: PreparedCase): ZeroForceFinding[] {
  const n = pm.jointIds.length;
  const removed = new Uint8Array(pm.members.length);
  const findings: ZeroForceFinding[] = [];
  const casePart = `case-${stepIdPart(lc.id)}`;
  const eligible = (j: number) => pm.supportAt[j] < 0 && lc.fx[j] === 0 && lc.fy[j] === 0;
  const activeAt = (j: number): number[] => {
    const out: number[] = [];
    for (let k = pm.incidentStart[j]; k < pm.incidentStart[j + 1]; k++) {
      const e = pm.incident[k];
      if (!removed[e]) out.push(e);
    }
    return out;
  };
  // Direction of member e seen from joint j (unit vector).
  const dirFrom = (e: number, j: number): [number, number] => {
    const mb = pm.members[e];
    return mb.a === j ? [mb.cx, mb.cy] : [-mb.cx, -mb.cy];
  };
  const collinear = (e: number, f: number, j: number) => {
    const [ax, ay] = dirFrom(e, j);
    const [bx, by] = dirFrom(f, j);
    return Math.abs(ax * by - ay * bx) < COLLINEAR_TOLERANCE;
  };

  let candidates: number[] = [];
  for (let j = 0; j < n; j++) if (eligible(j)) candidates.push(j);
  let pass = 0;
  while (candidates.length) {
    pass++;
    const found: { e: number; j: number; rule: 1 | 2; pair?: [number, number] }[] = [];
    const marked = new Set<number>();
    for (const j of candidates) {
      const act = activeAt(j);
      if (act.length === 2) {
        if (!collinear(act[0], act[1], j)) {
          for (const e of act) if (!marked.has(e)) {
            marked.add(e);
            found.push({ e, j, rule: 1 });
          }
        }
      } else if (act.length === 3) {
        const pairs: [number, number, number][] = [
          [0, 1, 2],
          [0, 2, 1],
          [1, 2, 0],
        ];
        const hits = pairs.filter(([p, q]) => collinear(act[p], act[q], j));
        if (hits.length === 1) {
          const [p, q, t] = hits[0];
          const e = act[t];
          if (!marked.has(e)) {
            marked.add(e);
            found.push({ e, j, rule: 2, pair: [act[p], act[q]] });
          }
        }
      }
    }
    if (!found.length) break;
    const next = new Set<number>();
    for (const f of found) {
      removed[f.e] = 1;
      const mb = pm.members[f.e];
      for (const k of [mb.a, mb.b]) if (eligible(k)) next.add(k);
      findings.push({
        id: `${casePart}/zero-force-${stepIdPart(mb.id)}`,
        caseId: lc.id,
        title: `Zero-force member ${mb.tag}`,
        kind: 'zero-force',
        member: mb.id,
        memberTag: mb.tag,
        joint: pm.jointIds[f.j],
        jointTag: pm.jointTags[f.j],
        rule: f.rule,
        pass,
        ...(f.pair ? { collinear: [pm.members[f.pair[0]].id, pm.members[f.pair[1]].id] as [string, string] } : {}),
      });
    }
    candidates = [...next].sort((p, q) => p - q);
  }
  return findings;
}
