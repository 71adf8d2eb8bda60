/**
 * Benchmark entry point: `npm run -s bench -- [--json] [--quick] [--out FILE] [prefix ...]`,
 * the same runner as `chronomesh bench` (see bench/command.ts).
 *
 * Positional arguments are component-name prefixes (`time.`, `space.stiffness`, `expr.`, …)
 * selecting which rows run. `--json` prints one JSON document
 * `{"rows":[{"component","size","nsPerUnit",...}]}` as the last line of stdout
 * (npm's own banner precedes it unless npm runs with `-s`); otherwise a table.
 * `--out FILE` also writes the JSON document to FILE.
 * `--quick` uses smaller sizes (for smoke testing the harness).
 */
import { benchCommand } from '../src/cli/bench-command';
import { CliError } from '../src/cli/cli-error';
import { runCompare } from './compare';

const args = process.argv.slice(2);
const prefixes = args.filter((a) => !a.startsWith('--'));
// compare.: adaptive solver against time stepping, a one-shot table of its own (long; runs only
// when asked for by prefix, from a repository checkout).
if (prefixes.some((p) => p.startsWith('compare'))) {
  runCompare(prefixes, args.includes('--quick'));
  process.exit(0);
}

try {
  process.exitCode = benchCommand(process.argv.slice(2));
} catch (e) {
  if (!(e instanceof CliError)) throw e;
  console.error(`bench: ${e.message}`);
  process.exitCode = e.status;
}
