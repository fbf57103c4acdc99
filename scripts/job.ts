/**
 * The job file of `npm run -s solve` and `npm run -s sheet`, read from disk into a truss model.
 * The format and its checks are the app's (server/modules/job-files/job-file.ts, documented in
 * README "Job files"); this file reads the job and its drawing.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import type { TrussModel } from '@shared/model/truss';
import type { TakeoffInput } from '@shared/schemas/run.schema';
import { JobError, jobModel, jobModelSolved, jobParse, type Job } from '../server/modules/job-files/job-file';

export { JobError, jobSchema, type Job } from '../server/modules/job-files/job-file';

/**
 * Reads, validates and converts a job file. `model` is what the solver reads (the loads
 * as the cases hold them, the design sections' stiffness filled in); `saved` is the model as the
 * app keeps it, with `takeoff` apart. Both have the roof loading's loads in its marked cases.
 * @throws JobError for a missing or unreadable file, bad JSON or a bad field; the drawing import
 * and the solver throw their own typed errors (DxfImportError, SolverError).
 */
export function jobLoad(jobPath: string): { job: Job; model: TrussModel; saved: TrussModel; takeoff: TakeoffInput | null } {
  let text: string;
  try {
    text = readFileSync(jobPath, 'utf8');
  } catch {
    throw new JobError(`Cannot read the job file ${jobPath}.`);
  }
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    throw new JobError(`The job file ${jobPath} is not valid JSON (${(e as Error).message}).`);
  }
  const job = jobParse(raw, jobPath);
  const jobDir = path.dirname(path.resolve(jobPath));
  const readDrawing = (relative: string): Uint8Array => {
    const file = path.resolve(jobDir, relative);
    try {
      return new Uint8Array(readFileSync(file));
    } catch {
      throw new JobError(`Cannot read the drawing ${relative} (looked for ${file}).`);
    }
  };
  const jm = jobModel(job, readDrawing);
  return { job, model: jobModelSolved(jm), saved: jm.model, takeoff: jm.takeoff };
}
