import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import madge from 'madge';
import { describe, expect, it } from 'vitest';

const root = path.resolve(import.meta.dirname, '../..');

/** Import cycles among the given folders, type-only imports included (a loop is a loop). */
async function importCycles(base: string, folders: string[], tsConfig?: string): Promise<string[][]> {
  const graph = await madge(
    folders.map((f) => path.join(base, f)),
    { baseDir: base, fileExtensions: ['ts', 'tsx'], ...(tsConfig ? { tsConfig } : {}) },
  );
  return graph.circular();
}

describe('import graph', () => {
  it('has no import loops in src/, server/, shared/, scripts/ or bench/', async () => {
    const cycles = await importCycles(root, ['src', 'server', 'shared', 'scripts', 'bench'], path.join(root, 'tsconfig.json'));
    // Printed in full on failure: each entry is one loop, file by file.
    expect(cycles).toEqual([]);
    // madge parses every file of the repository: about 10 s on a quiet machine, 40 s or more on a
    // loaded one, so the limit is generous (it is a structure check, not a timing).
  }, 180_000);

  it('the check sees a loop when there is one (two files importing each other)', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-loop-'));
    try {
      fs.writeFileSync(path.join(dir, 'a.ts'), "import { b } from './b';\nexport const a = () => b();\n");
      fs.writeFileSync(path.join(dir, 'b.ts'), "import { a } from './a';\nexport const b = () => a;\n");
      fs.writeFileSync(path.join(dir, 'c.ts'), "import { a } from './a';\nexport const c = a;\n");
      const cycles = await importCycles(dir, ['.']);
      expect(cycles).toEqual([['a.ts', 'b.ts']]);
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
