/** `chronomesh demo [--quick] [--out DIR]`. */
import { parseCommandArgs } from './args';
import { runDemo } from './demo';
import { DEMO_HELP } from './help';

/** The `demo` subcommand; returns the exit status. */
export function demoCommand(argv: string[]): number {
  const { values } = parseCommandArgs('demo', argv, { quick: { type: 'boolean' }, out: { type: 'string' }, help: { type: 'boolean', short: 'h' } });
  if (values.help) {
    console.log(DEMO_HELP);
    return 0;
  }
  runDemo(values.quick === true, typeof values.out === 'string' ? values.out : 'out');
  return 0;
}
