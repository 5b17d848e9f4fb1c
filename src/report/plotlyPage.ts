/**
 * A single self-contained HTML page with plotly.js inlined (works offline,
 * no network). Figures are given as plotly data/layout objects; all user text
 * in them must already be plain text: trace names and titles are escaped here
 * because plotly renders pseudo-HTML in them.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { escapeHtml, jsonForScript } from './escape.js';

export interface Figure {
  id: string;
  data: unknown[];
  layout: Record<string, unknown>;
}

let plotlySource: string | null = null;

/** The minified plotly.js bundle from the installed plotly.js-dist-min package. */
export function plotlyBundle(): string {
  if (plotlySource === null) {
    const require = createRequire(import.meta.url);
    plotlySource = readFileSync(require.resolve('plotly.js-dist-min'), 'utf8');
  }
  return plotlySource;
}

const PSEUDO_HTML_KEYS = new Set(['name', 'text', 'title']);

/** Escape strings that plotly would render as pseudo-HTML (names, titles, text). */
function escapePlotText(v: unknown, key = ''): unknown {
  if (typeof v === 'string') return PSEUDO_HTML_KEYS.has(key) ? escapeHtml(v) : v;
  if (Array.isArray(v)) return v.map((x) => escapePlotText(x, key));
  if (v && typeof v === 'object' && !(ArrayBuffer.isView(v))) {
    const out: Record<string, unknown> = {};
    for (const [k, x] of Object.entries(v as Record<string, unknown>)) out[k] = escapePlotText(x, k);
    return out;
  }
  if (ArrayBuffer.isView(v)) return Array.from(v as unknown as ArrayLike<number>);
  return v;
}

export function renderPlotlyPage(opts: { title: string; bodyHtml: string; figures: Figure[] }): string {
  const figs = opts.figures.map((f) => ({ id: f.id, data: escapePlotText(f.data), layout: escapePlotText(f.layout) }));
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(opts.title)}</title>
<style>
body { font-family: system-ui, -apple-system, "Segoe UI", sans-serif; margin: 1.5rem auto; max-width: 1100px; padding: 0 1rem; color: #1b1b1b; }
h1 { font-size: 1.5rem; } h2 { font-size: 1.15rem; margin-top: 2rem; }
table { border-collapse: collapse; font-size: 0.9rem; } td, th { padding: 0.2rem 0.6rem; border-bottom: 1px solid #ddd; text-align: left; }
.caution { background: #fff6e0; border-left: 4px solid #c98a00; padding: 0.5rem 0.8rem; }
.plot { width: 100%; height: 460px; }
code { background: #f2f2f2; padding: 0 0.2rem; }
</style>
<script>${plotlyBundle().replace(/<\/script/gi, '<\\/script')}</script>
</head>
<body>
${opts.bodyHtml}
<script>
(function () {
  var figs = ${jsonForScript(figs)};
  figs.forEach(function (f) {
    var el = document.getElementById(f.id);
    if (el) Plotly.newPlot(el, f.data, f.layout, { responsive: true, displaylogo: false });
  });
})();
</script>
</body>
</html>
`;
}
