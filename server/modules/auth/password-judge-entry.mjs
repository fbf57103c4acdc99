// Entry of the password-judging worker thread: registers tsx (with the repository's tsconfig)
// and loads the TypeScript worker module, as the solver's worker entry does.
import { fileURLToPath } from 'node:url';
import { register } from 'tsx/esm/api';

register({ tsconfig: fileURLToPath(new URL('../../../tsconfig.json', import.meta.url)) });
await import('./password-judge-worker.ts');
