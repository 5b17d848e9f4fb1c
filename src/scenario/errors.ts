/**
 * Input errors. A `FieldProblem` names the offending field (a dotted path such
 * as `planet.period`), where the file has it (line and column, when known), the
 * value given and what is allowed. The CLI turns an `InputError` into one
 * clear line per problem and exit code 2.
 */

export interface FieldProblem {
  /** Dotted path of the field, e.g. `planet.period`. */
  path: string;
  /** The value as given (stringified and truncated for the message). */
  value: unknown;
  /** What is allowed, in plain words. */
  allowed: string;
  /** 1-based line and column of the field in the file it came from, when known. */
  line?: number;
  column?: number;
}

/** One or more problems with user input; `problems` lists every one at once. */
export class InputError extends Error {
  readonly problems: FieldProblem[];
  constructor(problems: FieldProblem[], context?: string) {
    super(formatProblems(problems, context));
    this.name = 'InputError';
    this.problems = problems;
  }
}

/** The longest value a message repeats; longer ones are cut with an ellipsis. */
export const MAX_VALUE_CHARS = 80;

/** Cut `text` to `max` characters (code points), ending with "…" when cut. */
export function truncateText(text: string, max = MAX_VALUE_CHARS): string {
  const chars = Array.from(text);
  return chars.length <= max ? text : chars.slice(0, max - 1).join('') + '…';
}

export function describeValue(value: unknown): string {
  if (value === undefined) return '(missing)';
  let text: string;
  if (typeof value === 'string') text = JSON.stringify(value);
  else if (typeof value === 'number' || typeof value === 'boolean' || value === null) text = String(value);
  else {
    try {
      text = JSON.stringify(value) ?? String(value);
    } catch {
      text = String(value);
    }
  }
  return escapeControl(truncateText(text));
}

/**
 * Control characters (C0 but newline, DEL, C1), line/paragraph separators and
 * bidirectional overrides written as \uXXXX, so text taken from a file cannot
 * move the cursor, recolour or reorder a terminal. Newlines are kept: a
 * message of several problems is several lines.
 */
export function escapeControl(text: string): string {
  // eslint-disable-next-line no-control-regex
  return text.replace(/[\u0000-\u0009\u000b-\u001f\u007f-\u009f\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069]/g,
    (c) => '\\u' + c.charCodeAt(0).toString(16).padStart(4, '0'));
}

/** "path (line L, column C)" or just the path. */
export function problemWhere(p: FieldProblem): string {
  const path = escapeControl(truncateText(p.path));
  if (p.line === undefined) return path;
  return `${path} (line ${p.line}${p.column !== undefined ? `, column ${p.column}` : ''})`;
}

export function formatProblem(p: FieldProblem): string {
  return `${problemWhere(p)}: got ${describeValue(p.value)}; ${escapeControl(p.allowed)}`;
}

export function formatProblems(problems: FieldProblem[], context?: string): string {
  const head = context ? `${escapeControl(context)}: ` : '';
  if (problems.length === 1) return head + formatProblem(problems[0]);
  return `${head}${problems.length} problems\n` + problems.map((p) => '  - ' + formatProblem(p)).join('\n');
}

/** Throw an `InputError` for a single field. */
export function fieldError(path: string, value: unknown, allowed: string): InputError {
  return new InputError([{ path, value, allowed }]);
}
