/** Argument parsing with Node's util.parseArgs, turning its errors into one-line usage errors. */
import { parseArgs, type ParseArgsConfig } from 'node:util';
import { nearestName } from '../problem-file/index';
import { CliError } from './cli-error';

type Options = NonNullable<ParseArgsConfig['options']>;

/** Parsed options (string or boolean by their declared type) and positionals. */
export interface ParsedArgs {
  values: Record<string, string | boolean | undefined>;
  positionals: string[];
}

/** Parses `argv` strictly; unknown options get a "did you mean" hint. */
export function parseCommandArgs(command: string, argv: string[], options: Options): ParsedArgs {
  try {
    return parseArgs({ args: argv, options, allowPositionals: true, strict: true }) as ParsedArgs;
  } catch (e) {
    const err = e as { code?: string; message: string };
    if (err.code === 'ERR_PARSE_ARGS_UNKNOWN_OPTION') {
      const opt = /'([^']+)'/.exec(err.message)?.[1] ?? '?';
      const hint = nearestName(opt.replace(/^-+/, '').split('=')[0]!, Object.keys(options));
      throw new CliError(`${command}: unknown option ${opt}${hint ? `; did you mean --${hint}?` : ''} (see \`chronomesh ${command} --help\`)`);
    }
    if (err.code === 'ERR_PARSE_ARGS_INVALID_OPTION_VALUE') throw new CliError(`${command}: ${err.message.split('\n')[0]}`);
    throw new CliError(`${command}: ${err.message.split('\n')[0]}`);
  }
}
