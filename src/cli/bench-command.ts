/** `chronomesh bench [SUITE…] [--json] [--quick] [--out FILE]`: the benchmark harness, shipped in the package. */
import { runBench } from '../../bench/command';
import { parseCommandArgs } from './args';
import { BENCH_HELP } from './help';

/** The `bench` subcommand; returns the exit status. */
export function benchCommand(argv: string[]): number {
  const { values, positionals } = parseCommandArgs('bench', argv, {
    json: { type: 'boolean' }, quick: { type: 'boolean' }, out: { type: 'string' }, help: { type: 'boolean', short: 'h' },
  });
  if (values.help) {
    console.log(BENCH_HELP);
    return 0;
  }
  runBench({ json: values.json === true, quick: values.quick === true, prefixes: positionals, ...(typeof values.out === 'string' ? { out: values.out } : {}) });
  return 0;
}
