/**
 * How the app, the e-mails and the calc sheet name the numbered things people cite, so each is
 * called the same everywhere:
 *  - an analysis run is "Run 2 of T7": numbered 1, 2, … within its truss (never the firm-wide row id);
 *  - an uploaded DXF is a "drawing version" (1, 2, … per truss);
 *  - a save of the working model is a "model save" (1, 2, … per truss);
 *  - a calc sheet's revision keeps its letter ("revision B"), from sheetRevisionLabel.
 * "Version" alone and "revision" for anything but a sheet are not used in user-facing text.
 */

/** "Run 2 of T7", or "Run 2" where the truss is plain from the page. */
export function runName(number: number, trussName?: string): string {
  return trussName ? `Run ${number} of ${trussName}` : `Run ${number}`;
}

/** "drawing version 3" (capitalise at the start of a sentence with {@link capitalised}). */
export function drawingVersionName(version: number): string {
  return `drawing version ${version}`;
}

/** "model save 5". */
export function modelSaveName(version: number): string {
  return `model save ${version}`;
}

export function capitalised(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** A file name part made of a truss or job name: letters, digits, dot, dash and underscore only. */
export function fileNamePart(text: string): string {
  return text.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '') || 'truss';
}
