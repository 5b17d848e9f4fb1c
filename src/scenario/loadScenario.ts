/**
 * Reads a YAML scenario file and validates it. YAML syntax errors and
 * validation problems both become an `InputError` whose messages carry the
 * file name and, where the YAML has the node, its line number.
 */
import { readFileSync } from 'node:fs';
import { LineCounter, parseDocument } from 'yaml';
import { InputError, type FieldProblem } from './errors.js';
import { parseScenario } from './parseScenario.js';
import type { Scenario } from './types.js';

/** Parse YAML text into plain values, with line numbers for later messages. */
export function parseYamlWithLines(text: string, source: string): { value: unknown; lineOf: (path: string) => number | null } {
  const lineCounter = new LineCounter();
  const doc = parseDocument(text, { lineCounter, prettyErrors: false, uniqueKeys: true });
  if (doc.errors.length > 0) {
    const problems: FieldProblem[] = doc.errors.map((e) => {
      const pos = e.linePos?.[0];
      return { path: pos ? `line ${pos.line}, column ${pos.col}` : '(file)', value: e.code, allowed: e.message.split('\n')[0] };
    });
    throw new InputError(problems, `${source}: not valid YAML`);
  }
  const lineOf = (path: string): number | null => {
    const keys = path.split('.');
    for (let n = keys.length; n > 0; n--) {
      const node = doc.getIn(keys.slice(0, n), true) as { range?: [number, number, number] } | undefined;
      if (node && node.range) return lineCounter.linePos(node.range[0]).line;
    }
    return null;
  };
  return { value: doc.toJS(), lineOf };
}

/** Attach "(line N)" to each problem path where the file has that node. */
export function withLines(e: InputError, lineOf: (path: string) => number | null, source: string): InputError {
  const problems = e.problems.map((p) => {
    const line = lineOf(p.path);
    return line === null ? p : { ...p, path: `${p.path} (line ${line})` };
  });
  return new InputError(problems, source);
}

export function parseScenarioText(text: string, source = 'scenario'): Scenario {
  const { value, lineOf } = parseYamlWithLines(text, source);
  try {
    return parseScenario(value, source);
  } catch (e) {
    if (e instanceof InputError) throw withLines(e, lineOf, source);
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
