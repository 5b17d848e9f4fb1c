/** Process exit codes used by every command. */
export const EXIT_OK = 0;
/** Internal failure (a bug): message with a stack trace. */
export const EXIT_FAILURE = 1;
/** Bad input: one clear message naming the field, the value and what is allowed. */
export const EXIT_BAD_INPUT = 2;
/** Interrupted by the user (SIGINT). */
export const EXIT_INTERRUPTED = 130;
