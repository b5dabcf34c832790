import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = path.resolve(__dirname, '../../..');

/** Value imports (not `import type`) between the project's own files under `dirs`. */
function importGraph(dirs: string[]): Map<string, string[]> {
  const files: string[] = [];
  const walk = (d: string) => {
    for (const e of fs.readdirSync(d, { withFileTypes: true })) {
      const p = path.join(d, e.name);
      if (e.isDirectory()) walk(p);
      else if (/\.tsx?$/.test(e.name) && !e.name.endsWith('.d.ts')) files.push(p);
    }
  };
  dirs.forEach((d) => walk(path.join(ROOT, d)));
  const resolve = (from: string, spec: string) => {
    const base = path.resolve(path.dirname(from), spec);
    return [`${base}.ts`, `${base}.tsx`, path.join(base, 'index.ts')].find((f) => fs.existsSync(f));
  };
  const graph = new Map<string, string[]>();
  for (const f of files) {
    const src = fs.readFileSync(f, 'utf8');
    const deps = [...src.matchAll(/^import\s+(?!type\b)[^;]*?from\s+'(\.[^']+)'/gms)].map((m) => resolve(f, m[1])).filter((x): x is string => !!x);
    graph.set(f, deps);
  }
  return graph;
}

/** Every cycle found by a depth-first search, as a list of files relative to the root. */
function cycles(graph: Map<string, string[]>): string[][] {
  const out: string[][] = [];
  const state = new Map<string, 'active' | 'done'>();
  const stack: string[] = [];
  const visit = (n: string) => {
    state.set(n, 'active');
    stack.push(n);
    for (const d of graph.get(n) ?? []) {
      if (state.get(d) === 'active') out.push([...stack.slice(stack.indexOf(d)), d].map((f) => path.relative(ROOT, f)));
      else if (!state.has(d)) visit(d);
    }
    stack.pop();
    state.set(n, 'done');
  };
  for (const n of graph.keys()) if (!state.has(n)) visit(n);
  return out;
}

describe('imports', () => {
  it('has no import cycle anywhere in server/', () => {
    expect(cycles(importGraph(['server']))).toEqual([]);
  });
});
