/**
 * Compiles the server, the worker process and their worker threads into build/ (git-ignored)
 * with esbuild, so production runs plain JavaScript with `node` (tsx is for development).
 * `npm start` runs this when a source file is newer than build/.stamp.
 *
 *   npx tsx scripts/build-server.ts
 *
 * Output: build/server.js, build/worker.js (processes), build/migrate.js, build/seed.js,
 * build/compute-worker.js and build/membershipCsv.js (worker threads), build/migrations/.
 * npm packages stay external (loaded from node_modules as usual).
 */
import { build, type Plugin } from 'esbuild';
import fs from 'node:fs';
import path from 'node:path';

const ROOT = path.resolve(__dirname, '..');
const OUT = path.join(ROOT, 'build');

/**
 * The simulation thread pool loads its worker from `worker.ts` through tsx; in the build it is
 * the bundled compute-worker.js beside the server bundle, loaded directly.
 */
const computeWorkerPath: Plugin = {
  name: 'compute-worker-path',
  setup(b) {
    b.onLoad({ filter: /server[\\/]compute[\\/]threads\.ts$/ }, async (args) => {
      let src = await fs.promises.readFile(args.path, 'utf8');
      const before = src;
      src = src.replace(/path\.join\(__dirname, 'worker\.ts'\)/, "path.join(__dirname, 'compute-worker.js')").replace(/require\('tsx\/cjs'\);\s*/, '');
      if (src === before || src.includes("'worker.ts'") || src.includes('tsx/cjs')) {
        throw new Error('server/compute/threads.ts no longer loads its worker as scripts/build-server.ts expects: update the compute-worker-path plugin');
      }
      return { contents: src, loader: 'ts' };
    });
  },
};

async function main() {
  const t0 = Date.now();
  fs.rmSync(OUT, { recursive: true, force: true });
  await build({
    absWorkingDir: ROOT,
    entryPoints: {
      server: 'server/index.ts',
      worker: 'server/jobs/worker.ts',
      migrate: 'db/migrate.ts',
      seed: 'db/seed.ts',
      'compute-worker': 'server/compute/worker.ts',
      membershipCsv: 'server/threads/membershipCsv.ts',
    },
    outdir: OUT,
    bundle: true,
    platform: 'node',
    target: 'node20',
    format: 'cjs',
    packages: 'external',
    sourcemap: true,
    logLevel: 'warning',
    plugins: [computeWorkerPath],
  });
  fs.cpSync(path.join(ROOT, 'db/migrations'), path.join(OUT, 'migrations'), { recursive: true });
  fs.writeFileSync(path.join(OUT, '.stamp'), new Date().toISOString());
  console.log(`keelson: server built into build/ in ${Date.now() - t0} ms`);
}

main().catch((err) => {
  console.error('keelson: server build failed:', err instanceof Error ? err.message : err);
  process.exit(1);
});
