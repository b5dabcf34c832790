import { readFileSync, writeFileSync } from 'node:fs';

import { resultToJson, runScenario, validateScenario } from '../simulation';

/**
 * Command line: run a scenario file (format 1 or 2, simulation/README.md) and print (or write)
 * the result JSON. The file handling lives here; the engine in simulation/ does no I/O.
 *
 *   npm run project -- <scenario.json> [--out result.json] [--include-pots]
 *
 * Exit codes: 0 done; 2 bad arguments, unreadable file, invalid JSON or invalid scenario
 * (every invalid field is listed on stderr as "path: reason").
 */
const USAGE = 'usage: npm run project -- <scenario.json> [--out result.json] [--include-pots]';

function fail(lines: string[]): never {
  for (const line of lines) process.stderr.write(`${line}\n`);
  process.exit(2);
}

function main(argv: string[]): void {
  let file: string | undefined;
  let out: string | undefined;
  let includePots = false;
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg === '--out') {
      out = argv[++i];
      if (!out) fail(['--out needs a file name', USAGE]);
    } else if (arg === '--include-pots') includePots = true;
    else if (arg === '--help' || arg === '-h') {
      process.stdout.write(`${USAGE}\n`);
      return;
    } else if (arg.startsWith('--')) fail([`unknown option ${arg}`, USAGE]);
    else if (file === undefined) file = arg;
    else fail([`unexpected argument ${arg}`, USAGE]);
  }
  if (!file) fail([USAGE]);

  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (error) {
    fail([`cannot read ${file}: ${error instanceof Error ? error.message : String(error)}`]);
  }
  let input: unknown;
  try {
    input = JSON.parse(text);
  } catch (error) {
    fail([`${file} is not valid JSON: ${error instanceof Error ? error.message : String(error)}`]);
  }
  const validation = validateScenario(input);
  if (!validation.ok) {
    fail([
      `${file}: invalid scenario (${validation.issues.length} problem${validation.issues.length === 1 ? '' : 's'})`,
      ...validation.issues.map((issue) => `  ${issue.path || '(scenario)'}: ${issue.message}`),
    ]);
  }
  const result = runScenario(validation.scenario);
  const json = `${JSON.stringify(resultToJson(result, { includePots }), null, 2)}\n`;
  if (out) writeFileSync(out, json);
  else process.stdout.write(json);
}

main(process.argv.slice(2));
