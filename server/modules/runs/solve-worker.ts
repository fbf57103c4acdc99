import { parentPort } from 'node:worker_threads';
import { SolverError, trussSolve, type TrussAnalysis } from '@shared/solver';
import { designJson, designSummaryOf, runDesign } from '@shared/design/basis';
import type { SolveJob, SolveReply, SolveSummary } from './solve-pool';

function summaryOf(analysis: TrussAnalysis): SolveSummary {
  const c = analysis.classification;
  const residuals = [...analysis.cases.map((r) => r.residual), ...analysis.combinations.map((r) => r.residual)];
  return {
    classification: { kind: c.kind, degree: c.degree, mechanismJoints: c.mechanismJoints, message: c.message },
    maxResidual: residuals.length ? Math.max(...residuals) : null,
    caseCount: analysis.cases.length,
    combinationCount: analysis.combinations.length,
  };
}

/** Solves one job. The result goes back as JSON text: one string copy instead of a deep clone. */
function solve(job: SolveJob): SolveReply {
  try {
    const analysis = trussSolve(job.model);
    // JSON writes Infinity and NaN as null: a result that is not a finite number everywhere
    // is a failed run with a sentence, never "solved" with empty forces.
    let nonFinite = 0;
    const analysisJson = JSON.stringify(analysis, (_key, value) => {
      if (typeof value === 'number' && !Number.isFinite(value)) nonFinite++;
      return value;
    });
    if (nonFinite > 0) {
      return {
        jobId: job.jobId,
        type: 'failed',
        error: {
          code: 'non-finite-result',
          message: `The solution has ${nonFinite} value${nonFinite === 1 ? '' : 's'} that ${nonFinite === 1 ? 'is' : 'are'} not a finite number (the loads or stiffnesses are too large or too small for the arithmetic). Check the loads, factors and member properties for a unit slip, then run again.`,
        },
      };
    }
    // Member design checks on the forces just found (the model's saved sections); a design error
    // is recorded with the run, the forces stand.
    const design = runDesign(job.model, analysis);
    const summary = summaryOf(analysis);
    if (design) summary.design = designSummaryOf(design);
    const withDesign = design ? `${analysisJson.slice(0, -1)},"design":${designJson(design)}}` : analysisJson;
    return { jobId: job.jobId, type: 'solved', analysisJson: withDesign, summary };
  } catch (err) {
    if (err instanceof SolverError) return { jobId: job.jobId, type: 'failed', error: { code: err.code, message: err.message } };
    const message = err instanceof Error ? err.message : String(err);
    return { jobId: job.jobId, type: 'failed', error: { code: 'solver-crashed', message: `The solver stopped with an unexpected error (${message}). Tell your admin; the model is unchanged.` } };
  }
}

const port = parentPort;
if (!port) throw new Error('solve-worker.ts runs only as a worker thread (see solve-pool.ts).');
port.on('message', (job: SolveJob) => {
  port.postMessage({ jobId: job.jobId, type: 'started' } satisfies SolveReply);
  port.postMessage(solve(job));
});
