import path from 'node:path';
import madge from 'madge';
import { beforeAll, describe, expect, it } from 'vitest';

const root = path.resolve(import.meta.dirname, '../..');

/**
 * Which way imports go (the folder map in DEVELOPERS.md). Each rule: a file matching `from`
 * imports no file for which `not` holds; `not` sees the match of `from`, so "another feature"
 * is every feature but the file's own.
 */
interface Rule {
  why: string;
  from: RegExp;
  not: (file: string, match: RegExpMatchArray) => boolean;
}

const RULES: Rule[] = [
  { why: 'shared/ is imported by client and server and imports neither', from: /^shared\//, not: (f) => /^(src|server)\//.test(f) },
  { why: 'the client never imports the server', from: /^src\//, not: (f) => f.startsWith('server/') },
  { why: 'the server never imports the client', from: /^server\//, not: (f) => f.startsWith('src/') },
  {
    why: 'a client feature imports no other feature (app/ composes them)',
    from: /^src\/features\/([^/]+)\//,
    not: (f, m) => f.startsWith('src/features/') && !f.startsWith(`src/features/${m[1]}/`),
  },
  { why: 'app/ composes the features; they, components/ and lib/ never import it', from: /^src\/(features|components|lib)\//, not: (f) => f.startsWith('src/app/') },
  {
    why: 'calc-sheets renders and knows nothing of revisions or records',
    from: /^server\/modules\/calc-sheets\//,
    not: (f) => /^server\/modules\/(sheet-revisions|records)\//.test(f),
  },
  {
    why: 'records keep what is issued and do not import the check flow or the renderer',
    from: /^server\/modules\/records\//,
    not: (f) => /^server\/modules\/(sheet-revisions|calc-sheets)\//.test(f),
  },
];

/** Every import that breaks a rule, as "from → to (why)". */
function directionViolations(graph: Record<string, string[]>, rules: Rule[] = RULES): string[] {
  const out: string[] = [];
  for (const [file, deps] of Object.entries(graph)) {
    for (const rule of rules) {
      const m = file.match(rule.from);
      if (!m) continue;
      for (const dep of deps) if (rule.not(dep, m)) out.push(`${file} → ${dep} (${rule.why})`);
    }
  }
  return out.sort();
}

describe('module directions', () => {
  let graph: Record<string, string[]>;
  beforeAll(async () => {
    const g = await madge(
      ['src', 'server', 'shared'].map((f) => path.join(root, f)),
      { baseDir: root, fileExtensions: ['ts', 'tsx'], tsConfig: path.join(root, 'tsconfig.json') },
    );
    graph = g.obj();
  }, 180_000); // madge parses the whole repository; slow on a loaded machine

  it('the graph follows the @/ and @shared/ aliases (else the rules would see no edge)', () => {
    expect(graph['src/app/routes/sheet.tsx']).toContain('src/features/records/api/get-archive.ts');
    expect(graph['server/modules/records/archive.service.ts']).toContain('shared/schemas/review.schema.ts');
  });

  it('no import goes against the folder map', () => {
    // Printed in full on failure: one line per offending import.
    expect(directionViolations(graph)).toEqual([]);
  });

  it('the check names an import that goes the wrong way (a feature importing another, records importing the check flow)', () => {
    const bad = {
      'src/features/records/components/x.tsx': ['src/features/records/api/y.ts', 'src/features/sheet-revisions/utils/z.ts'],
      'server/modules/records/a.ts': ['server/modules/sheet-revisions/sheet-revisions.service.ts', 'server/db/models.ts'],
      'server/modules/sheet-revisions/b.ts': ['server/modules/records/records.repository.ts'],
    };
    expect(directionViolations(bad)).toEqual([
      'server/modules/records/a.ts → server/modules/sheet-revisions/sheet-revisions.service.ts (records keep what is issued and do not import the check flow or the renderer)',
      'src/features/records/components/x.tsx → src/features/sheet-revisions/utils/z.ts (a client feature imports no other feature (app/ composes them))',
    ]);
  });
});
