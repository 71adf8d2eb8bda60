#!/usr/bin/env node
/**
 * The `chronomesh` command line: `solve`, `bench`, `demo`, `--version`, `--help`.
 * Input errors exit with status 2 and one line on stderr (a stack trace only with --debug); a solve
 * that stops before reaching its file's tolerance exits with status 3 after writing its results;
 * other failures exit with status 1.
 */
import { ChronomeshError } from '../index';
import pkg from '../../package.json';
import { benchCommand } from './bench-command';
import { CliError } from './cli-error';
import { demoCommand } from './demo-command';
import { MAIN_HELP } from './help';
import { solveCommand } from './solve-command';
import { nearestName } from '../problem-file/index';

const COMMANDS: Record<string, (argv: string[]) => number> = { solve: solveCommand, bench: benchCommand, demo: demoCommand };

/** Runs the command line on `argv` (without node and script) and returns the exit status. */
export function main(argv: string[]): number {
  const debug = argv.includes('--debug');
  try {
    const [first, ...rest] = argv;
    if (first === undefined || first === '--help' || first === '-h' || first === 'help') {
      console.log(MAIN_HELP);
      return first === undefined ? 2 : 0;
    }
    if (first === '--version' || first === '-v') {
      console.log(pkg.version);
      return 0;
    }
    const command = COMMANDS[first];
    if (!command) {
      const hint = nearestName(first.replace(/^-+/, ''), Object.keys(COMMANDS));
      throw new CliError(`unknown command '${first}'${hint ? `; did you mean '${hint}'?` : ''} (see \`chronomesh --help\`)`);
    }
    return command(rest);
  } catch (e) {
    if (e instanceof CliError) {
      process.stderr.write(`chronomesh: ${e.message}\n`);
      if (debug) process.stderr.write(`${e.stack}\n`);
      return e.status;
    }
    const what = e instanceof ChronomeshError ? `${e.name}: ${e.message}` : e instanceof Error ? `${e.name}: ${e.message}` : String(e);
    process.stderr.write(`chronomesh: ${what.split('\n')[0]}${debug ? '' : ' (run with --debug for details)'}\n`);
    if (debug && e instanceof Error) process.stderr.write(`${e.stack}\n`);
    return 1;
  }
}

process.exitCode = main(process.argv.slice(2));
