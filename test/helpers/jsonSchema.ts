/**
 * A minimal JSON Schema (draft 2020-12) checker for the tests: the subset the
 * shipped schemas (schemas/*.schema.json) use — type (one or a list),
 * properties, required, additionalProperties: false, items, enum, const,
 * anyOf, oneOf and local $ref ("#", "#/$defs/name"). Anything else in a
 * schema is an error here, so a schema cannot silently use a keyword this
 * checker ignores. Returns one "path: problem" line per violation.
 */
import { readFileSync } from 'node:fs';

type Schema = Record<string, unknown>;

const KNOWN = new Set(['$schema', '$id', 'title', 'description', '$defs', 'type', 'properties', 'required', 'additionalProperties', 'items', 'enum', 'const', 'anyOf', 'oneOf', '$ref']);

export function loadSchema(name: string): Schema {
  return JSON.parse(readFileSync(new URL(`../../schemas/${name}.schema.json`, import.meta.url), 'utf8')) as Schema;
}

function typeOf(v: unknown): string {
  if (v === null) return 'null';
  if (Array.isArray(v)) return 'array';
  if (typeof v === 'number') return Number.isInteger(v) ? 'integer' : 'number';
  return typeof v;
}

function typeMatches(v: unknown, t: string): boolean {
  const actual = typeOf(v);
  return actual === t || (t === 'number' && actual === 'integer');
}

function resolve(root: Schema, ref: string): Schema {
  if (ref === '#') return root;
  const m = /^#\/\$defs\/([A-Za-z0-9_]+)$/.exec(ref);
  const target = m ? (root.$defs as Record<string, Schema> | undefined)?.[m[1]] : undefined;
  if (!target) throw new Error(`unresolvable $ref ${ref}`);
  return target;
}

function check(root: Schema, s: Schema, v: unknown, path: string, out: string[]): void {
  for (const k of Object.keys(s)) if (!KNOWN.has(k)) throw new Error(`schema keyword ${k} at ${path} is not supported by this checker`);
  if (typeof s.$ref === 'string') check(root, resolve(root, s.$ref), v, path, out);
  if (s.type !== undefined) {
    const types = Array.isArray(s.type) ? (s.type as string[]) : [s.type as string];
    if (!types.some((t) => typeMatches(v, t))) {
      out.push(`${path}: expected ${types.join(' or ')}, got ${typeOf(v)}`);
      return;
    }
  }
  if ('const' in s && JSON.stringify(v) !== JSON.stringify(s.const)) out.push(`${path}: expected ${JSON.stringify(s.const)}, got ${JSON.stringify(v)}`);
  if (Array.isArray(s.enum) && !s.enum.some((e) => JSON.stringify(e) === JSON.stringify(v))) out.push(`${path}: ${JSON.stringify(v)} is not one of ${JSON.stringify(s.enum)}`);
  if (Array.isArray(s.anyOf)) {
    const ok = (s.anyOf as Schema[]).some((sub) => validate(root, sub, v, path).length === 0);
    if (!ok) out.push(`${path}: matches none of anyOf (${(s.anyOf as Schema[]).map((sub) => validate(root, sub, v, path)[0]).join(' | ')})`);
  }
  if (Array.isArray(s.oneOf)) {
    const n = (s.oneOf as Schema[]).filter((sub) => validate(root, sub, v, path).length === 0).length;
    if (n !== 1) out.push(`${path}: matches ${n} of the oneOf branches, not exactly 1`);
  }
  if (v !== null && typeof v === 'object' && !Array.isArray(v)) {
    const o = v as Record<string, unknown>;
    const props = (s.properties ?? {}) as Record<string, Schema>;
    for (const r of (s.required ?? []) as string[]) if (!(r in o)) out.push(`${path}: missing ${r}`);
    for (const [k, val] of Object.entries(o)) {
      if (props[k]) check(root, props[k], val, `${path}.${k}`, out);
      else if (s.additionalProperties === false) out.push(`${path}: unexpected key ${k}`);
    }
  }
  if (Array.isArray(v) && s.items) v.forEach((x, i) => check(root, s.items as Schema, x, `${path}[${i}]`, out));
}

function validate(root: Schema, s: Schema, v: unknown, path: string): string[] {
  const out: string[] = [];
  check(root, s, v, path, out);
  return out;
}

/** Every violation of `value` against the schema, as "path: problem" lines; empty when valid. */
export function schemaProblems(schema: Schema, value: unknown): string[] {
  return validate(schema, schema, value, '$');
}

/** Every property name a schema declares (recursively, $defs included): the names an output may use. */
export function schemaPropertyNames(schema: Schema): Set<string> {
  const names = new Set<string>();
  const walk = (s: unknown): void => {
    if (Array.isArray(s)) return s.forEach(walk);
    if (s === null || typeof s !== 'object') return;
    const o = s as Schema;
    if (o.properties && typeof o.properties === 'object') for (const k of Object.keys(o.properties)) names.add(k);
    for (const v of Object.values(o)) walk(v);
  };
  walk(schema);
  return names;
}

/** Every object key used anywhere in a JSON value. */
export function keysOf(value: unknown, out = new Set<string>()): Set<string> {
  if (Array.isArray(value)) value.forEach((x) => keysOf(x, out));
  else if (value !== null && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) {
      out.add(k);
      keysOf(v, out);
    }
  }
  return out;
}
