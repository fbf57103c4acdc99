import type { TrussModel } from '@shared/model/truss';
import { residualCheck } from './check';
import { trussClassify } from './classify';
import { jointsSolve } from './joints';
import { modelPrepare, type PreparedModel } from './prepare';
import { stepIdPart } from './step-id';
import { stiffnessSolve } from './stiffness';
import { loadsSymmetric, mirrorFind, symmetryDescribe } from './symmetry';
import type {
  CaseResult,
  CombinationResult,
  EnvelopeRow,
  ReactionEnvelopeRow,
  SolvedForce,
  SupportReaction,
  TrussAnalysis,
} from './types';
import { zeroForceFind } from './zero-force';

function reactionsReport(pm: PreparedModel, R: ArrayLike<number>): SupportReaction[] {
  return pm.supports.map((sp) => {
    let rx = 0;
    let ry = 0;
    const components: SolvedForce[] = sp.reactions.map((k) => {
      const rc = pm.reactions[k];
      rx += R[k] * rc.dx;
      ry += R[k] * rc.dy;
      return { ref: { type: 'reaction', joint: pm.jointIds[sp.joint], component: rc.component }, symbol: rc.symbol, label: rc.label, value: R[k] };
    });
    return {
      joint: pm.jointIds[sp.joint],
      tag: pm.jointTags[sp.joint],
      kind: sp.kind,
      ...(sp.kind === 'roller' ? { angleDeg: sp.angleDeg } : {}),
      rx,
      ry,
      components,
    };
  });
}

function forcesRecord(pm: PreparedModel, N: ArrayLike<number>): Record<string, number> {
  const out: Record<string, number> = {};
  pm.members.forEach((mb, e) => {
    out[mb.id] = N[e] === 0 ? 0 : N[e];
  });
  return out;
}

/**
 * Analyses a plane pin-jointed truss: stability and determinacy, then per load case the
 * zero-force members, support reactions, member forces with their steps (method of joints, a
 * simultaneous solve where it gets stuck, or the direct stiffness method when indeterminate),
 * an independent equilibrium residual, mirror symmetry, the combinations and the envelope.
 *
 * Units: m, kN; member forces tension positive; reactions +x right, +y up.
 * An unstable model returns its classification only (no cases). Throws `SolverError` on bad
 * input (see errors.ts for the codes), and `missing-stiffness` for an indeterminate truss with
 * members lacking E and A.
 */
export function trussSolve(model: TrussModel): TrussAnalysis {
  const pm = modelPrepare(model);
  const classification = trussClassify(pm);
  const indeterminate = classification.kind === 'indeterminate';
  const mirror = mirrorFind(pm, indeterminate);
  const symmetry = symmetryDescribe(pm, mirror);
  if (classification.kind === 'unstable') {
    return { classification, symmetry, cases: [], combinations: [], envelope: [], reactionEnvelope: [], envelopeSource: 'cases' };
  }

  const raw: { N: Float64Array; R: Float64Array }[] = [];
  const cases: CaseResult[] = pm.cases.map((lc) => {
    let scale = 0;
    for (let j = 0; j < lc.fx.length; j++) scale = Math.max(scale, Math.hypot(lc.fx[j], lc.fy[j]));
    const zeroForce = zeroForceFind(pm, lc);
    let N: Float64Array;
    let R: Float64Array;
    let rest: Pick<CaseResult, 'reactionSteps' | 'jointSteps' | 'simultaneousSteps' | 'stiffnessSteps' | 'method'> & { reactionNote?: string };
    if (indeterminate) {
      const st = stiffnessSolve(pm, lc, scale);
      N = st.N;
      R = st.R;
      rest = { method: 'stiffness', reactionSteps: [], reactionNote: 'The truss is statically indeterminate: reactions follow from the stiffness solution and the equilibrium of each supported joint.', jointSteps: [], simultaneousSteps: [], stiffnessSteps: st.steps };
    } else {
      const js = jointsSolve(pm, lc, zeroForce, scale);
      N = js.N;
      R = js.R;
      rest = {
        method: js.simultaneousSteps.length ? 'joints-and-simultaneous' : 'joints',
        reactionSteps: js.reactionSteps,
        ...(js.reactionNote ? { reactionNote: js.reactionNote } : {}),
        jointSteps: js.jointSteps,
        simultaneousSteps: js.simultaneousSteps,
        stiffnessSteps: [],
      };
    }
    raw.push({ N, R });
    const chk = residualCheck(pm, lc.fx, lc.fy, N, R);
    const symmetric = mirror ? loadsSymmetric(mirror, lc) : false;
    let maxPairDifference: number | null = null;
    if (mirror && symmetric) {
      maxPairDifference = 0;
      mirror.memberMirror.forEach((f, e) => {
        maxPairDifference = Math.max(maxPairDifference as number, Math.abs(N[e] - N[f]));
      });
    }
    const residualJoint = chk.joint >= 0 ? pm.jointIds[chk.joint] : null;
    return {
      caseId: lc.id,
      caseName: lc.name,
      ...rest,
      forces: forcesRecord(pm, N),
      reactions: reactionsReport(pm, R),
      zeroForce,
      check: {
        id: `case-${stepIdPart(lc.id)}/check`,
        caseId: lc.id,
        title: 'Equilibrium check',
        kind: 'check',
        residual: chk.residual,
        residualJoint,
        residualJointTag: chk.joint >= 0 ? pm.jointTags[chk.joint] : null,
        largestLoad: chk.largestLoad,
      },
      residual: chk.residual,
      residualJoint,
      symmetry: { loadsSymmetric: symmetric, maxPairDifference },
    };
  });

  // Combinations by superposition (linear elastic, small displacements).
  const caseIndex = new Map(pm.cases.map((lc, i) => [lc.id, i]));
  const combinations: CombinationResult[] = (model.combinations ?? []).map((combo) => {
    const N = new Float64Array(pm.members.length);
    const R = new Float64Array(pm.reactions.length);
    const fx = new Float64Array(pm.jointIds.length);
    const fy = new Float64Array(pm.jointIds.length);
    for (const [caseId, factor] of Object.entries(combo.factors)) {
      const i = caseIndex.get(caseId) as number;
      const lc = pm.cases[i];
      for (let e = 0; e < N.length; e++) N[e] += factor * raw[i].N[e];
      for (let k = 0; k < R.length; k++) R[k] += factor * raw[i].R[k];
      for (let j = 0; j < fx.length; j++) {
        fx[j] += factor * lc.fx[j];
        fy[j] += factor * lc.fy[j];
      }
    }
    return {
      name: combo.name,
      factors: { ...combo.factors },
      ...(combo.clause ? { clause: combo.clause } : {}),
      forces: forcesRecord(pm, N),
      reactions: reactionsReport(pm, R),
      residual: residualCheck(pm, fx, fy, N, R).residual,
    };
  });

  const envelopeSource = combinations.length ? 'combinations' : 'cases';
  const sources = combinations.length
    ? combinations.map((c) => ({ name: c.name, forces: c.forces }))
    : cases.map((c) => ({ name: c.caseId, forces: c.forces }));
  const envelope: EnvelopeRow[] = pm.members.map((mb) => {
    const row: EnvelopeRow = { member: mb.id, tag: mb.tag, maxTension: 0, maxTensionCombo: null, maxCompression: 0, maxCompressionCombo: null, governing: null, governingForce: 0 };
    for (const s of sources) {
      const v = s.forces[mb.id];
      if (v > row.maxTension) {
        row.maxTension = v;
        row.maxTensionCombo = s.name;
      }
      if (v < row.maxCompression) {
        row.maxCompression = v;
        row.maxCompressionCombo = s.name;
      }
      if (row.governing === null || Math.abs(v) > Math.abs(row.governingForce)) {
        row.governing = s.name;
        row.governingForce = v;
      }
    }
    return row;
  });

  const reactionEnvelope = reactionEnvelopeBuild(reactionSourcesOf({ cases, combinations }));

  return { classification, symmetry, cases, combinations, envelope, reactionEnvelope, envelopeSource };
}

/** What the reaction envelope runs over: the combinations, or the cases when there are none (as the member envelope). */
function reactionSourcesOf(analysis: Pick<TrussAnalysis, 'cases' | 'combinations'>): { name: string; reactions: SupportReaction[] }[] {
  return analysis.combinations.length
    ? analysis.combinations.map((c) => ({ name: c.name, reactions: c.reactions }))
    : analysis.cases.map((c) => ({ name: c.caseId, reactions: c.reactions }));
}

/**
 * The reaction envelope of an analysis: the stored one, or built from the stored reactions of
 * its cases and combinations for runs solved before the solver kept it.
 */
export function reactionEnvelopeOf(analysis: TrussAnalysis): ReactionEnvelopeRow[] {
  if (analysis.classification.kind === 'unstable') return [];
  return analysis.reactionEnvelope ?? reactionEnvelopeBuild(reactionSourcesOf(analysis));
}

/** Reactions below this (kN) count as zero: no uplift is reported for round-off. */
const UPLIFT_TOLERANCE = 1e-9;

/**
 * Max and min of each support's rx and ry over the sources, with the source that gives each,
 * and uplift said in words when ry goes below zero (the bearing must be held down).
 */
export function reactionEnvelopeBuild(sources: { name: string; reactions: SupportReaction[] }[]): ReactionEnvelopeRow[] {
  const rows = new Map<string, ReactionEnvelopeRow>();
  for (const s of sources) {
    for (const r of s.reactions) {
      let row = rows.get(r.joint);
      if (!row) {
        row = { joint: r.joint, at: r.tag, rxMax: r.rx, rxMaxCombo: s.name, rxMin: r.rx, rxMinCombo: s.name, ryMax: r.ry, ryMaxCombo: s.name, ryMin: r.ry, ryMinCombo: s.name, uplift: null };
        rows.set(r.joint, row);
        continue;
      }
      if (r.rx > row.rxMax) [row.rxMax, row.rxMaxCombo] = [r.rx, s.name];
      if (r.rx < row.rxMin) [row.rxMin, row.rxMinCombo] = [r.rx, s.name];
      if (r.ry > row.ryMax) [row.ryMax, row.ryMaxCombo] = [r.ry, s.name];
      if (r.ry < row.ryMin) [row.ryMin, row.ryMinCombo] = [r.ry, s.name];
    }
  }
  for (const row of rows.values()) {
    if (row.ryMin < -UPLIFT_TOLERANCE) {
      row.uplift = `Support ${row.at} is lifted under ${row.ryMinCombo}: it must hold the truss down with ${(-row.ryMin).toFixed(2)} kN (design the hold-down for it).`;
    }
  }
  return [...rows.values()];
}
