/**
 * `npm run -s solve -- JOB.json`: solves one truss job and prints one JSON result on stdout.
 *
 * JOB.json: the job file (README "Job files"; keys and checks in server/modules/job-files/job-file.ts).
 *
 * Output: classification (with conditioning and cause), joints, members, cases and combinations (forces, reactions), "envelope"
 * (per member maxTension, maxCompression, governing) and "reactionEnvelope" (per support: joint
 * tag, at [x, y], rxMax/rxMin/ryMax/ryMin in kN with the combination, or case, of each in
 * rxMaxCombo …, and "uplift" in words or null). A job with "design" adds "design" (per member:
 * utilisation, governing combination, pass, checks with clause and ratio, steps) and, with
 * "deflection", "deflection" (per joint and service combination, mm): both made by the app's own
 * run code (shared/design/basis.ts runDesign) on the model the app's run solves.
 *
 * Exit 0 with the result for a solved or classified (also unstable) truss; exit 2 with one line
 * on stderr for bad input; exit 1 for an unexpected failure.
 */
import type { TrussModel } from '@shared/model/truss';
import { caseSteps, reactionEnvelopeOf, SolverError, trussSolve, type SupportReaction } from '@shared/solver/index';
import { DxfImportError } from '@shared/dxf-import/index';
import { JobError, jobLoad } from './job';
import { runDesign, type RunDesign } from '@shared/design/basis';

function reactionsOut(list: SupportReaction[], joints: Map<string, TrussModel['joints'][number]>) {
  return list.map((r) => {
    const j = joints.get(r.joint)!;
    return { at: [j.x, j.y], joint: r.tag, type: r.kind, rx: r.rx, ry: r.ry };
  });
}

/** The "design" and "deflection" outputs of a run's design (lengths mm, forces kN). */
function designOut(d: RunDesign | null): Record<string, unknown> {
  if (!d) return {};
  // An unstable truss has no forces to check: the classification says why, the design says it was not checked.
  if (d.error) return { design: [], designError: d.error };
  return {
    design: d.members.map((r) => ({
      member: r.tag,
      group: r.group,
      utilisation: r.utilisation,
      governing: r.governing,
      pass: r.pass,
      reversal: r.reversal,
      ...(r.refused ? { refused: r.refused } : {}),
      checks: r.checks.map((c) => ({
        clause: c.clause,
        sense: c.sense,
        combination: c.combination,
        ratio: c.ratio,
        ...(c.capacity !== undefined ? { capacity: c.capacity } : {}),
        ...(c.slenderness ? { slenderness: c.slenderness.value, limit: c.slenderness.limit } : {}),
      })),
      steps: { tension: r.tension?.steps ?? [], compression: r.compression?.steps ?? [] },
      notes: r.notes,
    })),
    ...(d.deflection.length
      ? {
          deflection: d.deflection.map((r) => ({
            at: r.at,
            joint: r.tag,
            combination: r.combination,
            dx: r.dx,
            dy: r.dy,
            span: r.span,
            limit: r.limit,
            allowed: r.allowed,
            ratio: r.ratio,
            pass: r.pass,
            table: r.tableY.map((t) => ({ member: t.tag, n: t.n, N: t.N, L: t.L, A: t.A, E: t.E, nNL_AE: t.term })),
          })),
        }
      : {}),
  };
}

function run(jobPath: string | undefined): unknown {
  if (!jobPath) throw new JobError('Usage: npm run -s solve -- JOB.json');
  const { model } = jobLoad(jobPath);
  const analysis = trussSolve(model);
  const jointById = new Map(model.joints.map((j) => [j.id, j]));
  const cls = analysis.classification;
  return {
    classification: {
      kind: cls.kind,
      degree: cls.degree,
      joints: cls.mechanismJoints.map((id) => jointById.get(id)!.tag),
      m: cls.m,
      r: cls.r,
      j: cls.j,
      rank: cls.rank,
      message: cls.message,
      // Stable: how near a mechanism (σmin, σmax of the joint-equilibrium matrix, 1/σmin, joints by tag).
      conditioning: cls.conditioning
        ? { measure: cls.conditioning.measure, sigmaMin: cls.conditioning.sigmaMin, sigmaMax: cls.conditioning.sigmaMax, ratio: cls.conditioning.ratio, amplification: cls.conditioning.amplification, nearMechanism: cls.conditioning.nearMechanism, joints: cls.conditioning.jointTags, message: cls.conditioning.message }
        : null,
      // Unstable: supports, members or both; an open panel's diagonal by joint tags when one helps.
      cause: cls.cause
        ? { kind: cls.cause.kind, reason: cls.cause.reason, ...(cls.cause.diagonal ? { diagonal: { from: cls.cause.diagonal.fromTag, to: cls.cause.diagonal.toTag, panel: cls.cause.diagonal.panel, makesStable: cls.cause.diagonal.makesStable } } : {}) }
        : null,
    },
    joints: model.joints.map((j) => ({ tag: j.tag, x: j.x, y: j.y })),
    members: model.members.map((m) => {
      const a = jointById.get(m.from)!;
      const b = jointById.get(m.to)!;
      return { tag: m.tag, from: [a.x, a.y], to: [b.x, b.y] };
    }),
    symmetry: analysis.symmetry,
    cases: Object.fromEntries(
      analysis.cases.map((c) => [
        c.caseId,
        {
          method: c.method,
          forces: c.forces,
          reactions: reactionsOut(c.reactions, jointById),
          zeroForce: c.zeroForce.map((z) => z.memberTag),
          residual: c.residual,
          residualJoint: c.residualJoint,
          steps: caseSteps(c),
        },
      ]),
    ),
    combinations: Object.fromEntries(
      analysis.combinations.map((c) => [c.name, { factors: c.factors, ...(c.clause ? { clause: c.clause } : {}), forces: c.forces, reactions: reactionsOut(c.reactions, jointById), residual: c.residual }]),
    ),
    envelope: analysis.envelope,
    reactionEnvelope: reactionEnvelopeOf(analysis).map((r) => {
      const j = jointById.get(r.joint)!;
      const { joint: _id, at: tag, ...extremes } = r;
      return { joint: tag, at: [j.x, j.y], ...extremes };
    }),
    ...designOut(runDesign(model, analysis)),
  };
}

function oneLine(message: string): string {
  return message.replace(/\s*\n\s*/g, ' ').trim();
}

try {
  const out = run(process.argv[2]);
  process.stdout.write(`${JSON.stringify(out)}\n`);
} catch (e) {
  if (e instanceof JobError || e instanceof SolverError || e instanceof DxfImportError) {
    const code = e instanceof JobError ? 'bad-job' : (e as SolverError | DxfImportError).code;
    process.stderr.write(`solve: ${code}: ${oneLine(e.message)}\n`);
    process.exitCode = 2;
  } else {
    process.stderr.write(`solve: unexpected failure: ${oneLine(e instanceof Error ? e.message : String(e))}\n`);
    process.exitCode = 1;
  }
}
