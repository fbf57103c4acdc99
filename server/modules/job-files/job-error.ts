/** Bad input in a job file: the message names the field or the item and what to do (exit 2 on the command line, 422 in the API). */
export class JobError extends Error {
  readonly code = 'bad-job';
}
