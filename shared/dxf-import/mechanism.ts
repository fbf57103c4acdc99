import type { Joint, Member, TrussModel } from '@shared/model/truss';
import { equilibriumRows, openPanelFind } from '@shared/solver/classify';
import { modelPrepare } from '@shared/solver/prepare';
import { equilibriumRank } from '@shared/solver/rank';

/**
 * Largest drawing (joints) whose equilibrium matrix is ranked at import; beyond it only the
 * count m + r < 2j is checked. The rank is about linear in the truss size (shared/solver/rank.ts);
 * the cap keeps a 100 000-segment drawing's import within its budget (bench:import). A safety
 * limit, no source.
 */
export const MECHANISM_RANK_MAX_JOINTS = 5_000;

/** What the import says about a likely mechanism, before anyone places supports or loads. */
export interface MechanismFinding {
  /** 'warning' when the truss will likely be a mechanism; 'info' when checked and none found. */
  severity: 'info' | 'warning';
  message: string;
  /** Joints concerned: the open panel's, else those that can move. Ids of the model. */
  joints: string[];
  /** Members concerned: the open panel's sides. */
  members: string[];
  m: number;
  j: number;
  /** The reactions assumed: 3, a pin and a roller. */
  r: number;
}

function tagList(tags: string[], max = 8): string {
  const shown = tags.slice(0, max);
  const rest = tags.length - shown.length;
  const list = shown.length <= 1 ? shown.join('') : `${shown.slice(0, -1).join(', ')} and ${shown[shown.length - 1]}`;
  return rest > 0 ? `${shown.join(', ')} and ${rest} more` : list;
}

/**
 * Checks an imported truss for a likely mechanism with the usual supports of a simply supported
 * truss assumed (r = 3: a pin at the leftmost joint, lowest of those, and a roller with a
 * vertical reaction at the rightmost, lowest of those): first the count m + r against 2j
 * (a plane truss needs m + r ≥ 2j; any statics text, from memory), then, up to
 * {@link MECHANISM_RANK_MAX_JOINTS} joints, the rank of the joint-equilibrium matrix and the
 * open panel (four members in a ring, no diagonal) whose diagonal would stiffen it — the
 * solver's own stability code (shared/solver/classify.ts, rank.ts).
 */
export function mechanismCheck(joints: readonly Joint[], members: readonly Member[]): MechanismFinding | null {
  const j = joints.length;
  const m = members.length;
  const r = 3;
  if (j < 2 || m < 1) return null;
  const assumption = 'taking r = 3 reactions (a pin and a roller, as for a simply supported truss)';
  const tagOf = new Map(joints.map((jt) => [jt.id, jt.tag]));
  const short = m + r < 2 * j;
  const countText = `m + r = ${m} + ${r} = ${m + r} ${short ? 'is less than' : 'against'} 2j = ${2 * j}, ${assumption}`;

  let left = joints[0]!;
  let right = joints[0]!;
  for (const jt of joints) {
    if (jt.x < left.x || (jt.x === left.x && jt.y < left.y)) left = jt;
    if (jt.x > right.x || (jt.x === right.x && jt.y < right.y)) right = jt;
  }
  if (left === right || j > MECHANISM_RANK_MAX_JOINTS) {
    if (!short) return null;
    return {
      severity: 'warning',
      message: `likely a mechanism before any load is placed: ${countText}, so it is short of ${2 * j - m - r} member${2 * j - m - r === 1 ? '' : 's'}; add the missing members (a diagonal in each open panel) or check the supports it will have`,
      joints: [],
      members: [],
      m,
      j,
      r,
    };
  }

  const model: TrussModel = {
    joints: [...joints],
    members: members.map(({ id, tag, from, to }) => ({ id, tag, from, to })),
    supports: [
      { joint: left.id, kind: 'pin' },
      { joint: right.id, kind: 'roller', angleDeg: 90 },
    ],
    loadCases: [],
    combinations: [],
  };
  let pm: ReturnType<typeof modelPrepare>;
  try {
    pm = modelPrepare(model);
  } catch {
    return null; // the solver names what is wrong when the engineer runs it
  }
  const rows = equilibriumRows(pm);
  const { rank } = equilibriumRank(pm, rows, false);
  if (rank === 2 * j) {
    return {
      severity: 'info',
      message: `checked for a mechanism, ${assumption}: m + r = ${m + r} ≥ 2j = ${2 * j} and the joint equilibrium equations are independent, so the members form a rigid truss`,
      joints: [],
      members: [],
      m,
      j,
      r,
    };
  }
  const moving = equilibriumRank(pm, rows, true).mechanismJoints;
  const panel = openPanelFind(pm, rank, new Set(moving));
  const parts: string[] = [];
  parts.push(
    short
      ? `likely a mechanism before any load is placed: ${countText}, so it is short of ${2 * j - m - r} member${2 * j - m - r === 1 ? '' : 's'}`
      : `likely a mechanism before any load is placed, ${assumption}: the count m + r = ${m + r} ≥ 2j = ${2 * j} is met, but the joint equilibrium equations are dependent (rank ${rank} < ${2 * j})`,
  );
  let jointIds: string[];
  let memberIds: string[] = [];
  if (panel) {
    const ring = panel.ring.map((i) => pm.jointIds[i]!);
    const ringTags = ring.map((id) => tagOf.get(id) ?? id);
    parts.push(
      `the panel ${ringTags.join('–')} has four sides and no diagonal; a member from ${tagOf.get(pm.jointIds[panel.from]!)} to ${tagOf.get(pm.jointIds[panel.to]!)} ${panel.stable ? 'makes the truss rigid' : 'takes away one way it can move (more are needed)'}`,
    );
    jointIds = ring;
    const onRing = new Set(ring.map((id, k) => [id, ring[(k + 1) % 4]!].sort().join('|')));
    memberIds = members.filter((mb) => onRing.has([mb.from, mb.to].sort().join('|'))).map((mb) => mb.id);
  } else {
    jointIds = moving.map((i) => pm.jointIds[i]!);
  }
  const movingTags = moving.map((i) => pm.jointTags[i]!);
  if (movingTags.length) parts.push(`joints that can move without any member changing length: ${tagList(movingTags)}`);
  return { severity: 'warning', message: parts.join('; '), joints: jointIds, members: memberIds, m, j, r };
}
