/**
 * moonsieve command line: parses arguments and calls library functions; no
 * physics here. Bad input (an `InputError`, or a commander usage error)
 * prints one clear message and exits with code 2, without a stack trace.
 */
import { Command, CommanderError } from 'commander';
import { escapeControl, InputError } from '../scenario/errors.js';
import { EXIT_BAD_INPUT, EXIT_FAILURE, EXIT_INTERRUPTED, EXIT_OK } from '../app/exitCodes.js';
import { registerSimulate } from './simulateCommand.js';
import { registerLimits } from './limitsCommand.js';
import { registerVet } from './vetCommand.js';
import { registerSweep } from './sweepCommand.js';
import { registerMerge } from './mergeCommand.js';
import { registerReport } from './reportCommand.js';
import { registerBudget } from './budgetCommand.js';
import { registerCalendar } from './calendarCommand.js';
import { registerRank } from './rankCommand.js';
import { SweepInterruptedError } from '../app/sweep/interrupted.js';
import { VERSION } from '../version.js';

import type { CliIo } from './cliIo.js';

export type { CliIo };

const defaultIo: CliIo = {
  out: (t) => process.stdout.write(t),
  err: (t) => process.stderr.write(t),
};

export function buildProgram(io: CliIo): Command {
  const program = new Command();
  program
    .name('moonsieve')
    .description('Exomoon transit-timing detectability planner')
    .version(VERSION)
    .exitOverride()
    .configureOutput({ writeOut: io.out, writeErr: io.err, outputError: (s, write) => write(s) })
    .showHelpAfterError('(run with --help for usage)');
  registerSweep(program, io);
  registerMerge(program, io);
  registerReport(program, io);
  registerSimulate(program, io);
  registerLimits(program, io);
  registerVet(program, io);
  registerBudget(program, io);
  registerCalendar(program, io);
  registerRank(program, io);
  return program;
}

/** Run the CLI; resolves to the process exit code. */
export async function main(argv: string[], rawIo: CliIo = defaultIo): Promise<number> {
  // Everything printed may carry text from the user's files and arguments (names, keys, values):
  // control characters are written as \uXXXX, never sent raw to the terminal (newlines kept).
  const io: CliIo = { out: (t) => rawIo.out(escapeControl(t)), err: (t) => rawIo.err(escapeControl(t)) };
  const program = buildProgram(io);
  try {
    await program.parseAsync(argv);
    return EXIT_OK;
  } catch (e) {
    if (e instanceof CommanderError) {
      if (e.code === 'commander.helpDisplayed' || e.code === 'commander.version' || e.code === 'commander.help') return EXIT_OK;
      return EXIT_BAD_INPUT; // commander already printed its one-line message
    }
    if (e instanceof SweepInterruptedError) return EXIT_INTERRUPTED; // the command already said how to resume
    if (e instanceof InputError) {
      io.err(`moonsieve: ${e.message}\n`);
      return EXIT_BAD_INPUT;
    }
    io.err(`moonsieve: internal error: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}\n`);
    return EXIT_FAILURE;
  }
}
