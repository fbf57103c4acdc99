// Entry of the drawing import worker thread. A worker starts as a bare Node thread without the
// parent's TypeScript loader, so it registers tsx (with the repository's tsconfig, for the
// @shared/* paths) and then loads the TypeScript worker module.
import { fileURLToPath } from 'node:url';
import { register } from 'tsx/esm/api';

register({ tsconfig: fileURLToPath(new URL('../../../tsconfig.json', import.meta.url)) });
await import('./import-worker.ts');
