import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

import { baseScenario } from './helpers';

const root = path.resolve(__dirname, '../../..');
const project = (...args: string[]) =>
  spawnSync(process.execPath, [require.resolve('tsx/cli'), path.join(root, 'scripts/project.ts'), ...args], { encoding: 'utf8', cwd: root });

// Each case starts a tsx process (a few seconds on a busy machine).
describe('npm run project (scripts/project.ts)', { timeout: 90_000 }, () => {
  it('exits with code 2 and lists every invalid field', () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'keelson-cli-'));
    const file = path.join(dir, 'bad.json');
    writeFileSync(file, JSON.stringify({ ...baseScenario({ paths: 0, seed: 1.5 }), version: 2, timing: { contributions: 'weekly' } }));
    const r = project(file);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/invalid scenario \(3 problems\)/);
    for (const field of ['seed', 'paths', 'timing.contributions']) expect(r.stderr).toContain(`  ${field}: `);
    expect(project(path.join(dir, 'missing.json')).status).toBe(2);
  });

  it('runs a format-2 example and writes the result with --out', () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'keelson-cli-'));
    const scenario = { ...JSON.parse(readFileSync(path.join(root, 'simulation/examples/thornwick-qualifying-earnings.json'), 'utf8')), paths: 300 };
    const file = path.join(dir, 'small.json');
    writeFileSync(file, JSON.stringify(scenario));
    const out = path.join(dir, 'result.json');
    const r = project(file, '--out', out, '--include-pots');
    expect(r.status, r.stderr).toBe(0);
    const result = JSON.parse(readFileSync(out, 'utf8'));
    expect(result.formatVersion).toBe(2);
    expect(result.conventions.contributionBasis.basis).toBe('qualifying-earnings');
    expect(result.results[0].terminalRealPots).toHaveLength(300);
  });
});
