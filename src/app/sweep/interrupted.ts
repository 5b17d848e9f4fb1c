/** Thrown by the CLI after a sweep was interrupted (the message is already printed); exit code 130. */
import { EXIT_INTERRUPTED } from '../exitCodes.js';

export class SweepInterruptedError extends Error {
  readonly exitCode = EXIT_INTERRUPTED;
  constructor(message: string) {
    super(message);
    this.name = 'SweepInterruptedError';
  }
}
