/**
 * The command-line driver: picks the command, prints its JSON result on stdout, or a clear
 * error on stderr with exit code 2 for bad input (1 for anything unexpected).
 */
import { isScienceInputError } from '../science/science-input-error';
import { type CliCommand, CliUsageError } from './cli-command';
import { COMMANDS } from './commands/index';

export interface CliIo {
  stdout: (text: string) => void;
  stderr: (text: string) => void;
}

const defaultIo: CliIo = {
  stdout: (text) => process.stdout.write(text),
  stderr: (text) => process.stderr.write(text),
};

/** Loads every command of the list (entries are commands or lazy imports of a command module). */
export async function loadCommands(): Promise<CliCommand[]> {
  const out: CliCommand[] = [];
  for (const entry of COMMANDS) out.push(typeof entry === 'function' ? (await entry()).command : entry);
  return out;
}

function overview(commands: CliCommand[]): string {
  const width = Math.max(...commands.map((c) => c.name.length));
  return [
    'Usage: spincycle <command> [options]   (JSON on stdout; `spincycle <command> --help` for details)',
    '',
    'Commands:',
    ...commands.map((c) => `  ${c.name.padEnd(width)}  ${c.summary}`),
    '',
  ].join('\n');
}

/** Any input error of the shared code that names its field (ScienceInputError, SkyInputError…). */
function isFieldError(err: unknown): boolean {
  return (
    err instanceof Error &&
    typeof (err as { field?: unknown }).field === 'string' &&
    typeof (err as { reason?: unknown }).reason === 'string'
  );
}

/** Runs the CLI on `argv` (without node and script) and returns the exit code. */
export async function runCli(argv: string[], io: CliIo = defaultIo): Promise<number> {
  const commands = await loadCommands();
  const [name, ...rest] = argv;
  if (name === undefined) {
    io.stderr(overview(commands));
    return 2;
  }
  if (name === '--help' || name === '-h' || name === 'help') {
    io.stdout(overview(commands));
    return 0;
  }
  const command = commands.find((c) => c.name === name);
  if (!command) {
    io.stderr(`error: unknown command "${name}"\n\n${overview(commands)}`);
    return 2;
  }
  if (rest.includes('--help') || rest.includes('-h')) {
    io.stdout(`${command.usage.trimEnd()}\n`);
    return 0;
  }
  try {
    const result = await command.run(rest);
    io.stdout(`${JSON.stringify(result, null, 2)}\n`);
    return 0;
  } catch (err) {
    if (isScienceInputError(err) || isFieldError(err)) {
      io.stderr(`error: ${(err as Error).message}\n`);
      return 2;
    }
    if (err instanceof CliUsageError) {
      io.stderr(`error: ${err.message}\n(see: spincycle ${command.name} --help)\n`);
      return 2;
    }
    io.stderr(`error: ${(err as Error)?.stack ?? String(err)}\n`);
    return 1;
  }
}
