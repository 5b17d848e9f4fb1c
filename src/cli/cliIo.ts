/** Where a command writes its text: stdout and stderr, replaceable in tests. */
export interface CliIo {
  out: (text: string) => void;
  err: (text: string) => void;
}
