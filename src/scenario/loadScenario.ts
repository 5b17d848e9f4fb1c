/**
 * Reads a YAML scenario file and validates it. YAML syntax errors and
 * validation problems both become an `InputError` whose messages carry the
 * file name and, where the YAML has the node, its line and column.
 */
import { readFileSync } from 'node:fs';
import { isMap, isPair, isScalar, isSeq, LineCounter, parseDocument, type Document } from 'yaml';
import { InputError, truncateText, type FieldProblem } from './errors.js';
import { parseScenario } from './parseScenario.js';
import type { Scenario } from './types.js';

/** A 1-based line and column in the source text. */
export interface SourcePosition {
  line: number;
  column: number;
}

/**
 * Most alias expansions a document may make. The yaml package stops a
 * document that expands more (a "billion laughs" alias bomb) with a
 * ReferenceError; here it becomes an input problem.
 */
const MAX_ALIAS_COUNT = 100;

/** Parse YAML text into plain values, with the source position of every dotted path for later messages. */
export function parseYamlWithLines(
  text: string,
  source: string,
): { value: unknown; lineOf: (path: string) => number | null; positionOf: (path: string) => SourcePosition | null } {
  const lineCounter = new LineCounter();
  const doc = parseDocument(text, { lineCounter, prettyErrors: false, uniqueKeys: true });
  const at = (offset: number): SourcePosition => {
    const p = lineCounter.linePos(offset);
    return { line: p.line, column: p.col };
  };
  if (doc.errors.length > 0) {
    // Only the first syntax error: the parser's later ones are mostly consequences of it.
    const e = doc.errors[0];
    const pos = at(e.pos[0]);
    const lineText = text.split(/\r?\n/)[pos.line - 1] ?? '';
    const more = doc.errors.length > 1 ? ' (later syntax errors, often caused by this one, are not listed)' : '';
    const message = /call stack/i.test(e.message) ? 'the document is nested too deeply to read' : e.message.split('\n')[0];
    throw new InputError(
      [{ path: '(YAML syntax)', line: pos.line, column: pos.column, value: lineText.trim(), allowed: message + more }],
      `${source}: not valid YAML`,
    );
  }
  let value: unknown;
  try {
    value = doc.toJS({ maxAliasCount: MAX_ALIAS_COUNT });
  } catch (e) {
    if (e instanceof ReferenceError || e instanceof RangeError) {
      throw new InputError(
        [{ path: '(YAML aliases)', value: truncateText(e.message), allowed: `a document may expand aliases (*name) at most ${MAX_ALIAS_COUNT} times; write the values out instead` }],
        `${source}: not a usable YAML document`,
      );
    }
    throw e;
  }
  const positionOf = (path: string): SourcePosition | null => {
    const offset = nodeOffset(doc, path);
    return offset === null ? null : at(offset);
  };
  const lineOf = (path: string): number | null => positionOf(path)?.line ?? null;
  return { value, lineOf, positionOf };
}

/**
 * Offset of the value at a dotted path (`planet.period`, `sweep.axes.0.count`),
 * or of its key when the value is empty, or of the nearest ancestor that exists.
 */
function nodeOffset(doc: Document, path: string): number | null {
  const keys = path.split('.');
  const chain: unknown[] = [doc.contents];
  let node: unknown = doc.contents;
  let keyOffset: number | null = null;
  for (const k of keys) {
    let next: unknown = undefined;
    keyOffset = null;
    if (isMap(node)) {
      const pair = node.items.find((it) => isPair(it) && (isScalar(it.key) ? String(it.key.value) === k : String(it.key) === k));
      if (pair) {
        next = pair.value;
        const kr = (pair.key as { range?: [number, number, number] } | null)?.range;
        keyOffset = kr ? kr[0] : null;
      }
    } else if (isSeq(node) && /^\d+$/.test(k)) {
      next = node.items[Number(k)];
    }
    if (next === undefined && keyOffset === null) break;
    node = next;
    chain.push(next ?? { range: keyOffset === null ? undefined : [keyOffset, keyOffset, keyOffset] });
    if (next === undefined || next === null) break;
  }
  // Nothing of the path is in the file (a missing top-level block): no position rather than line 1.
  if (chain.length === 1 && keys.length > 0 && path !== '(top level)') return null;
  for (let i = chain.length - 1; i >= 0; i--) {
    const r = (chain[i] as { range?: [number, number, number] } | null | undefined)?.range;
    if (r) return r[0];
  }
  return null;
}

/**
 * Attach the line and column to each problem whose path the file has.
 * `locate` may give a line alone (older callers) or a full position.
 */
export function withLines(e: InputError, locate: (path: string) => number | SourcePosition | null, source: string): InputError {
  const problems = e.problems.map((p): FieldProblem => {
    if (p.line !== undefined) return p;
    const where = locate(p.path);
    if (where === null) return p;
    return typeof where === 'number' ? { ...p, line: where } : { ...p, line: where.line, column: where.column };
  });
  return new InputError(problems, source);
}

export function parseScenarioText(text: string, source = 'scenario'): Scenario {
  const { value, positionOf } = parseYamlWithLines(text, source);
  try {
    return parseScenario(value, source);
  } catch (e) {
    if (e instanceof InputError) throw withLines(e, positionOf, source);
    throw e;
  }
}

export function loadScenario(path: string): Scenario {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError([{ path: 'SCENARIO', value: path, allowed: code === 'ENOENT' ? 'no such file' : `cannot read it (${code ?? String(e)})` }]);
  }
  return parseScenarioText(text, path);
}
