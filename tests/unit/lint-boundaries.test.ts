import fs from 'node:fs';
import path from 'node:path';
import { ESLint } from 'eslint';
import { beforeAll, describe, expect, it } from 'vitest';

/**
 * The layer boundaries of eslint.config.js, checked on deliberately wrong files: each fixture in
 * tests/fixtures/lint/ is linted as if it lived at the given place in the tree, and the errors
 * ESLint reports are compared with the imports that break a rule.
 */
const ROOT = path.resolve(__dirname, '../..');
const FIXTURES = path.join(ROOT, 'tests/fixtures/lint');
const BOUNDARY_RULES = new Set(['no-restricted-imports', '@typescript-eslint/no-restricted-imports', 'no-restricted-syntax']);

let eslint: ESLint;
beforeAll(() => {
  eslint = new ESLint({ cwd: ROOT });
});

/** The boundary errors for a fixture linted as `asPath`: each as "line: rule". */
async function boundaryErrors(fixture: string, asPath: string): Promise<{ line: number; message: string }[]> {
  const code = fs.readFileSync(path.join(FIXTURES, fixture), 'utf8');
  const [result] = await eslint.lintText(code, { filePath: path.join(ROOT, asPath) });
  return result.messages.filter((m) => m.ruleId && BOUNDARY_RULES.has(m.ruleId)).map((m) => ({ line: m.line, message: m.message }));
}
const lines = (errors: { line: number }[]) => errors.map((e) => e.line).sort((a, b) => a - b);

describe('layer boundaries in the linter', () => {
  it.each(['figures/wrong.ts', 'simulation/wrong.ts'])('%s may not do I/O or import Express, the database or React', async (asPath) => {
    const errors = await boundaryErrors('pure-with-io.ts', asPath);
    // node:fs, express, drizzle-orm, react and ../db/client: lines 2–6.
    expect(lines(errors)).toEqual([2, 3, 4, 5, 6]);
    expect(errors[0].message).toMatch(/no I\/O/);
  }, 30_000);

  it('exempts no file of the engine: the command-line runner that reads files lives in scripts/', async () => {
    expect(lines(await boundaryErrors('pure-with-io.ts', 'simulation/cli.ts'))).toEqual([2, 3, 4, 5, 6]);
    expect(await boundaryErrors('pure-with-io.ts', 'scripts/project.ts')).toEqual([]);
  });

  it('lets figures/ name the server’s types but not run its code', async () => {
    expect(lines(await boundaryErrors('figures-server-types.ts', 'figures/wrong.ts'))).toEqual([3]);
  });

  it('keeps components from fetching (types from hooks are fine)', async () => {
    const errors = await boundaryErrors('component-fetches.tsx', 'components/Wrong.tsx');
    expect(lines(errors)).toEqual([3]);
    expect(errors[0].message).toMatch(/Components do not fetch/);
  });

  it('keeps the client out of the server', async () => {
    const errors = await boundaryErrors('server-uses-client.ts', 'server/routes/wrong.ts');
    // components twice and hooks once; './app' (server/app.ts) is the server's own.
    expect(lines(errors)).toEqual([2, 3, 4]);
  });

  it('lets screens take only types from the server and the schema', async () => {
    expect(lines(await boundaryErrors('app-uses-server.tsx', 'app/(app)/wrong.tsx'))).toEqual([3, 4]);
  });

  it('keeps the database layer (and the demo seed) below the server', async () => {
    expect(lines(await boundaryErrors('figures-server-types.ts', 'db/seed.ts'))).toEqual([3]);
  });

  it('allows hand-written colours only in constants/theme.ts', async () => {
    const errors = await boundaryErrors('hex-colour.tsx', 'components/Wrong.tsx');
    expect(errors).toHaveLength(2);
    expect(errors[0].message).toMatch(/constants\/theme\.ts/);
    expect(await boundaryErrors('hex-colour.tsx', 'constants/theme.ts')).toEqual([]);
  });

  // The real tree is held to the same rules by `npm test`'s lint step (npx eslint .).
});
