/** Runs the real command line (`node --import tsx src/cli/main.ts …`) in a child process. */
import { execFile } from 'node:child_process';
import { resolve } from 'node:path';

export const ROOT = resolve(__dirname, '../..');

export interface CliRun {
  status: number;
  stdout: string;
  stderr: string;
}

export function runCli(args: string[], opts: { cwd?: string; timeoutMs?: number } = {}): Promise<CliRun> {
  return new Promise((done) => {
    execFile(process.execPath, ['--import', 'tsx', resolve(ROOT, 'src/cli/main.ts'), ...args], {
      cwd: opts.cwd ?? ROOT, timeout: opts.timeoutMs ?? 120000, maxBuffer: 1 << 24,
    }, (err, stdout, stderr) => {
      const status = err ? (typeof err.code === 'number' ? err.code : -1) : 0;
      done({ status, stdout, stderr });
    });
  });
}
