import { readFileSync } from 'node:fs';
import { isJobError, jobError, runBatch } from '../jobs/index';

/**
 * Rungbook calculation CLI: `npm run --silent calc -- '<json>'` or `… -- @job.json`.
 * Prints exactly one JSON document on stdout; exit code 2 when any job is invalid or fails.
 */
function readArgument(argv: string[]): string {
  if (argv.length !== 1) throw new CliError('usage: calc \'<json job or array>\' | calc @file.json');
  const arg = argv[0];
  if (arg.startsWith('@')) {
    try {
      return readFileSync(arg.slice(1), 'utf8');
    } catch {
      throw new CliError(`cannot read ${arg.slice(1)}`);
    }
  }
  return arg;
}

class CliError extends Error {}

function main(): number {
  let output: unknown;
  try {
    const text = readArgument(process.argv.slice(2));
    let input: unknown;
    try {
      input = JSON.parse(text);
    } catch (e) {
      throw new CliError(`invalid JSON: ${(e as Error).message}`);
    }
    output = runBatch(input);
  } catch (e) {
    output = e instanceof CliError ? jobError('parse', e.message) : jobError('internal', 'internal error');
  }
  process.stdout.write(`${JSON.stringify(output)}\n`);
  const failed = Array.isArray(output) ? output.some(isJobError) : isJobError(output);
  return failed ? 2 : 0;
}

// A reader that stops early (e.g. `| head`) closes the pipe: that ends the output, it is not a crash.
process.stdout.on('error', (error: NodeJS.ErrnoException) => process.exit(error.code === 'EPIPE' ? process.exitCode ?? 0 : 1));
process.exitCode = main();
