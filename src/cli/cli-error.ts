/** Errors of the command line that end the process with a status and one line on stderr. */

/** A usage or input error: exit status 2, message printed as one line. */
export class CliError extends Error {
  constructor(message: string, readonly status = 2) {
    super(message);
    this.name = 'CliError';
  }
}
