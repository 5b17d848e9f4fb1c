/**
 * Input errors. A `FieldError` names the offending field (a dotted path such
 * as `planet.period`), the value given and what is allowed. The CLI turns a
 * `InputError` into one clear message per field and exit code 2.
 */

export interface FieldProblem {
  /** Dotted path of the field, e.g. `planet.period`. */
  path: string;
  /** The value as given (stringified for the message). */
  value: unknown;
  /** What is allowed, in plain words. */
  allowed: string;
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

export function describeValue(value: unknown): string {
  if (value === undefined) return '(missing)';
  if (typeof value === 'string') return JSON.stringify(value);
  if (typeof value === 'number' || typeof value === 'boolean' || value === null) return String(value);
  try {
    return JSON.stringify(value);
  } catch {
    return String(value);
  }
}

export function formatProblem(p: FieldProblem): string {
  return `${p.path}: got ${describeValue(p.value)}; ${p.allowed}`;
}

export function formatProblems(problems: FieldProblem[], context?: string): string {
  const head = context ? `${context}: ` : '';
  if (problems.length === 1) return head + formatProblem(problems[0]);
  return `${head}${problems.length} problems\n` + problems.map((p) => '  - ' + formatProblem(p)).join('\n');
}

/** Throw an `InputError` for a single field. */
export function fieldError(path: string, value: unknown, allowed: string): InputError {
  return new InputError([{ path, value, allowed }]);
}
