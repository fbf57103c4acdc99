// Entry of the calc-sheet build worker thread: registers tsx (with the repository's tsconfig,
// for the @shared/* paths) and loads the TypeScript worker module, as solve-worker-entry.mjs does.
import { fileURLToPath } from 'node:url';
import { register } from 'tsx/esm/api';

register({ tsconfig: fileURLToPath(new URL('../../../tsconfig.json', import.meta.url)) });
await import('./sheet-build-worker.ts');
