import { buildClientIfNeeded } from './browser';

/** Builds the client once before any browser test runs, not once per test file. */
export default function setup(): void {
  buildClientIfNeeded();
}
