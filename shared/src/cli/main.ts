/** Entry point of the `spincycle` command line (see docs/command-line.md). */
import { runCli } from './run-cli';

runCli(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (err: unknown) => {
    process.stderr.write(`error: ${(err as Error)?.stack ?? String(err)}\n`);
    process.exitCode = 1;
  },
);
