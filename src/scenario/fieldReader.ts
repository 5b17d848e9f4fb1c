/**
 * Reads one mapping of a scenario document field by field, collecting every
 * problem instead of stopping at the first, and rejecting unknown keys (so a
 * typo such as `perod:` is caught rather than silently ignored).
 */
import { describeValue, type FieldProblem } from './errors.js';
import { SCENARIO_FIELDS, scenarioField, type ScenarioField } from './fields.js';
import { formatNumber, parseQuantity, writtenUnit, type QuantityKind } from './units.js';

/** Called with the dotted path of every field a reader looks at (tests check the field table with it). */
let fieldReadHook: ((path: string) => void) | null = null;
export function setFieldReadHook(hook: ((path: string) => void) | null): void {
  fieldReadHook = hook;
}

/** Options of `quantity`/`number` taken from a field-table entry. */
export interface TableOptions {
  required?: boolean;
}

export class FieldReader {
  readonly problems: FieldProblem[];
  private readonly obj: Record<string, unknown>;
  private readonly prefix: string;
  private readonly seen = new Set<string>();

  constructor(obj: unknown, prefix: string, problems: FieldProblem[]) {
    this.problems = problems;
    this.prefix = prefix;
    if (obj === undefined || obj === null) {
      this.obj = {};
    } else if (typeof obj !== 'object' || Array.isArray(obj)) {
      problems.push({ path: prefix || '(top level)', value: obj, allowed: 'expected a mapping of keys to values' });
      this.obj = {};
    } else {
      this.obj = obj as Record<string, unknown>;
    }
  }

  path(key: string): string {
    return this.prefix ? `${this.prefix}.${key}` : key;
  }

  has(key: string): boolean {
    return this.obj[key] !== undefined && this.obj[key] !== null;
  }

  raw(key: string): unknown {
    this.seen.add(key);
    if (fieldReadHook) fieldReadHook(this.path(key));
    return this.obj[key];
  }

  problem(key: string, value: unknown, allowed: string): void {
    this.problems.push({ path: this.path(key), value, allowed });
  }

  /** The table entry of a key of this mapping (src/scenario/fields.ts); a missing entry is a programming error. */
  entry(key: string): ScenarioField {
    const f = scenarioField(this.path(key));
    if (!f) throw new Error(`scenario field ${this.path(key)} is missing from the field table (src/scenario/fields.ts)`);
    return f;
  }

  /**
   * A quantity, plain number or integer read with the default and allowed
   * range of its field-table entry; an out-of-range value is told the range
   * in the unit it was written in.
   */
  field(key: string, opts: TableOptions = {}): number {
    const f = this.entry(key);
    const common = {
      required: opts.required,
      default: typeof f.default === 'number' ? f.default : undefined,
      min: f.min,
      minExclusive: f.minExclusive,
      max: f.max,
      maxExclusive: f.maxExclusive,
      table: f,
    };
    if (f.type === 'quantity') return this.quantity(key, f.kind as QuantityKind, { ...common, bare: f.bare as [number, string] | undefined });
    if (f.type === 'number' || f.type === 'integer') return this.number(key, { ...common, integer: f.type === 'integer' });
    throw new Error(`scenario field ${f.path} is a ${f.type}, not a number`);
  }

  /** One of the words of a choice field of the table, or its default. */
  fieldChoice<T extends string>(key: string): T {
    const f = this.entry(key);
    return this.choice(key, (f.choices ?? []) as readonly T[], (f.default ?? '') as T);
  }

  /**
   * A quantity with a unit; `bare` gives the SI size of a bare number.
   * Returns NaN (and records a problem) when missing-and-required or invalid.
   */
  quantity(
    key: string,
    kind: QuantityKind,
    opts: {
      bare?: [number, string];
      required?: boolean;
      default?: number;
      min?: number;
      minExclusive?: boolean;
      max?: number;
      maxExclusive?: boolean;
      rangeText?: string;
      table?: ScenarioField;
    } = {},
  ): number {
    const value = this.raw(key);
    if (value === undefined || value === null) {
      if (opts.default !== undefined) return opts.default;
      if (opts.required !== false) this.problem(key, value, `required: ${kindNeed(kind, opts.bare)}`);
      return Number.NaN;
    }
    let si: number;
    try {
      si = parseQuantity(value, this.path(key), kind, opts.bare?.[0], opts.bare?.[1]);
    } catch (e) {
      const probs = (e as { problems?: FieldProblem[] }).problems;
      if (probs) this.problems.push(...probs);
      else this.problem(key, value, String(e));
      return Number.NaN;
    }
    if (!inRange(si, opts)) {
      const written = writtenUnit(value, kind, opts.bare);
      this.problem(key, value, opts.rangeText ?? (opts.table ? tableRangeText(opts.table, written) : rangeText(opts, written)));
      return Number.NaN;
    }
    return si;
  }

  /** A plain number (no unit), e.g. an eccentricity or a Love number. */
  number(
    key: string,
    opts: {
      required?: boolean;
      default?: number;
      min?: number;
      minExclusive?: boolean;
      max?: number;
      maxExclusive?: boolean;
      integer?: boolean;
      rangeText?: string;
      table?: ScenarioField;
    } = {},
  ): number {
    const value = this.raw(key);
    if (value === undefined || value === null) {
      if (opts.default !== undefined) return opts.default;
      if (opts.required !== false) this.problem(key, value, `required: a number${rangeSuffix(opts)}`);
      return Number.NaN;
    }
    const n = typeof value === 'number' ? value : typeof value === 'string' && value.trim() !== '' ? Number(value) : NaN;
    if (!Number.isFinite(n) || (opts.integer && !Number.isInteger(n)) || !inRange(n, opts)) {
      this.problem(key, value, opts.rangeText ?? (opts.table ? tableRangeText(opts.table, null) : `expected ${opts.integer ? 'an integer' : 'a number'}${rangeSuffix(opts)}`));
      return Number.NaN;
    }
    return n;
  }

  /** One of a fixed set of words. */
  choice<T extends string>(key: string, options: readonly T[], fallback: T): T {
    const value = this.raw(key);
    if (value === undefined || value === null) return fallback;
    if (typeof value === 'string' && (options as readonly string[]).includes(value)) return value as T;
    this.problem(key, value, `expected one of ${options.map((o) => JSON.stringify(o)).join(', ')}`);
    return fallback;
  }

  string(key: string, fallback: string): string {
    const value = this.raw(key);
    if (value === undefined || value === null) return fallback;
    if (typeof value === 'string' && value.trim() !== '') return value;
    if (typeof value === 'number') return String(value);
    this.problem(key, value, 'expected a non-empty text');
    return fallback;
  }

  /** Record every key that no reader asked for as an unknown-key error. */
  rejectUnknown(known: readonly string[] = []): void {
    for (const k of Object.keys(this.obj)) {
      if (!this.seen.has(k) && !known.includes(k)) {
        const allowedKeys = [...new Set([...this.seen, ...known, ...tableChildren(this.prefix)])].sort();
        this.problems.push({
          path: this.path(k),
          value: this.obj[k],
          allowed: `unknown key; allowed keys here: ${allowedKeys.join(', ')}${suggest(k, allowedKeys)}`,
        });
      }
    }
  }
}

/** Keys the field table lists directly under a scenario block (none for the top level or other files). */
function tableChildren(prefix: string): string[] {
  if (!prefix) return [];
  return SCENARIO_FIELDS.filter((f) => f.path.startsWith(prefix + '.') && !f.path.slice(prefix.length + 1).includes('.')).map((f) => f.path.slice(prefix.length + 1));
}

function kindNeed(kind: QuantityKind, bare?: [number, string]): string {
  return `${kind === 'fraction' ? 'a fraction' : `a ${kind}`} with a unit${bare ? ` or a bare number in ${bare[1]}` : ''}`;
}

function inRange(x: number, o: { min?: number; minExclusive?: boolean; max?: number; maxExclusive?: boolean }): boolean {
  if (o.min !== undefined && !(o.minExclusive ? x > o.min : x >= o.min)) return false;
  if (o.max !== undefined && !(o.maxExclusive ? x < o.max : x <= o.max)) return false;
  return true;
}

function rangeSuffix(o: { min?: number; minExclusive?: boolean; max?: number; maxExclusive?: boolean }): string {
  const parts: string[] = [];
  if (o.min !== undefined) parts.push(`${o.minExclusive ? '>' : '≥'} ${o.min}`);
  if (o.max !== undefined) parts.push(`${o.maxExclusive ? '<' : '≤'} ${o.max}`);
  return parts.length ? ` ${parts.join(' and ')}` : '';
}

/** Out of range, stated in the unit the value was written in when it had one, else in SI. */
function rangeText(o: { min?: number; minExclusive?: boolean; max?: number; maxExclusive?: boolean }, written: { name: string; si: number } | null): string {
  return written ? `out of range: must be${boundsText(o, written)}` : `out of range: must be${rangeSuffix(o)} (SI)`;
}

/**
 * The allowed range of a table field in words: in the unit the value was
 * written in (`written`), and also in the table's unit when that differs.
 */
export function tableRangeText(f: ScenarioField, written: { name: string; si: number } | null): string {
  const what = f.noun ?? (f.type === 'integer' ? 'a whole number' : f.type === 'quantity' || f.type === 'level' ? `a ${f.kind ?? 'value'}` : 'a number');
  const show = f.show ? { name: f.show[1], si: f.show[0] } : null;
  const unit = written ?? show;
  let text = `expected ${what}${boundsText(f, unit)}`;
  if (written && show && written.name !== show.name && (f.min !== undefined || f.max !== undefined)) text += ` (${boundsText(f, show).trim()})`;
  if (f.rangeNote) text += `; ${f.rangeNote}`;
  return text;
}

/** " ≥ a U and ≤ b U" for a table field, its bounds divided by the unit's SI size. */
export function boundsText(f: Pick<ScenarioField, 'min' | 'minExclusive' | 'max' | 'maxExclusive'>, unit: { name: string; si: number } | null): string {
  const u = unit && unit.name !== 'a fraction' ? ` ${unit.name}` : '';
  const k = unit ? unit.si : 1;
  if (f.min !== undefined && f.max !== undefined && !f.minExclusive && !f.maxExclusive) return ` from ${formatNumber(f.min / k)} to ${formatNumber(f.max / k)}${u}`;
  const parts: string[] = [];
  if (f.min !== undefined) parts.push(`${f.minExclusive ? '>' : '≥'} ${formatNumber(f.min / k)}${u}`);
  if (f.max !== undefined) parts.push(`${f.maxExclusive ? '<' : '≤'} ${formatNumber(f.max / k)}${u}`);
  return parts.length ? ` ${parts.join(' and ')}` : '';
}

/** A near spelling, for typos (edit distance ≤ 2). */
function suggest(key: string, options: string[]): string {
  let best = '';
  let bestD = 3;
  for (const o of options) {
    const d = editDistance(key.toLowerCase(), o.toLowerCase());
    if (d < bestD) {
      bestD = d;
      best = o;
    }
  }
  return best ? ` (did you mean "${best}"?)` : '';
}

function editDistance(a: string, b: string): number {
  const dp = Array.from({ length: a.length + 1 }, (_, i) => [i, ...new Array<number>(b.length).fill(0)]);
  for (let j = 1; j <= b.length; j++) dp[0][j] = j;
  for (let i = 1; i <= a.length; i++)
    for (let j = 1; j <= b.length; j++)
      dp[i][j] = Math.min(dp[i - 1][j] + 1, dp[i][j - 1] + 1, dp[i - 1][j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1));
  return dp[a.length][b.length];
}

export { describeValue };
