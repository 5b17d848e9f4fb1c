/**
 * Sweep progress on stderr. On a terminal: one line redrawn in place with
 * "\r" (at most every 200 ms): a bar, cells done/total, rate and time left.
 * Elsewhere (batch-job logs, CI), where a redrawn line would be garbage:
 * plain timestamped lines every 10 % of the cells or every 30 s, whichever
 * comes first. Rate and time left count only the cells computed in this run.
 */

export interface ProgressStream {
  write(text: string): unknown;
  isTTY?: boolean;
}

export interface ProgressOptions {
  /** Cells in this run (the shard's cells, including those resumed from a checkpoint). */
  total: number;
  /** Cells already done when the run starts (resumed). */
  initial?: number;
  stream: ProgressStream;
  quiet?: boolean;
  /** Clock in ms (injectable for tests). */
  now?: () => number;
  label?: string;
}

export interface Progress {
  update(done: number): void;
  /** Final state: a last line (and a newline after the terminal bar). */
  finish(done: number): void;
  /** A one-line message (e.g. the calibration phase), timestamped in logs, above the bar on a terminal. */
  note(text: string): void;
}

const TTY_INTERVAL_MS = 200;
const LOG_INTERVAL_MS = 30_000;
const BAR_WIDTH = 24;

/** "45 s", "12 min", "3.4 h". */
export function formatDuration(seconds: number): string {
  if (!Number.isFinite(seconds)) return '?';
  if (seconds < 90) return `${Math.max(0, Math.round(seconds))} s`;
  if (seconds < 90 * 60) return `${Math.round(seconds / 60)} min`;
  return `${(seconds / 3600).toFixed(1)} h`;
}

function formatRate(perS: number): string {
  if (!(perS > 0) || !Number.isFinite(perS)) return '? cells/s';
  return `${perS >= 100 ? perS.toFixed(0) : perS >= 1 ? perS.toFixed(1) : perS.toPrecision(2)} cells/s`;
}

/** ISO 8601 UTC to the second, e.g. 2026-12-01T10:00:00Z. */
function timestamp(ms: number): string {
  return new Date(ms).toISOString().replace(/\.\d{3}Z$/, 'Z');
}

export function createProgress(o: ProgressOptions): Progress {
  if (o.quiet) return { update() {}, finish() {}, note() {} };
  const now = o.now ?? Date.now;
  const label = o.label ?? 'sweep';
  const total = o.total;
  const initial = o.initial ?? 0;
  const t0 = now();
  const tty = o.stream.isTTY === true;
  let lastDraw = Number.NEGATIVE_INFINITY;
  let lastLogTime = t0;
  let lastLogDecile = Math.floor((10 * initial) / Math.max(total, 1));
  let lastWidth = 0;

  const stats = (done: number): { pct: number; rateText: string; leftText: string } => {
    const elapsedS = (now() - t0) / 1000;
    const rate = elapsedS > 0 ? (done - initial) / elapsedS : Number.NaN;
    const pct = total > 0 ? (100 * done) / total : 100;
    const left = done >= total ? 0 : rate > 0 ? (total - done) / rate : Number.NaN;
    return { pct, rateText: formatRate(rate), leftText: done >= total ? 'done' : `~${formatDuration(left)} left` };
  };

  const ttyLine = (done: number): string => {
    const s = stats(done);
    const filled = total > 0 ? Math.round((BAR_WIDTH * done) / total) : BAR_WIDTH;
    const bar = '#'.repeat(filled) + '.'.repeat(BAR_WIDTH - filled);
    return `${label} [${bar}] ${done}/${total} cells (${Math.floor(s.pct)} %), ${s.rateText}, ${s.leftText}`;
  };

  const logLine = (done: number): string => {
    const s = stats(done);
    return `${timestamp(now())} ${label} ${done}/${total} cells (${Math.floor(s.pct)} %), ${s.rateText}, ${s.leftText}\n`;
  };

  const draw = (done: number): void => {
    const line = ttyLine(done);
    const pad = lastWidth > line.length ? ' '.repeat(lastWidth - line.length) : '';
    lastWidth = line.length;
    o.stream.write('\r' + line + pad);
  };

  if (!tty) o.stream.write(logLine(initial));

  return {
    update(done) {
      const t = now();
      if (tty) {
        if (t - lastDraw >= TTY_INTERVAL_MS) {
          lastDraw = t;
          draw(done);
        }
        return;
      }
      const decile = Math.floor((10 * done) / Math.max(total, 1));
      if ((decile > lastLogDecile && done < total) || t - lastLogTime >= LOG_INTERVAL_MS) {
        lastLogDecile = decile;
        lastLogTime = t;
        o.stream.write(logLine(done));
      }
    },
    note(text) {
      if (tty) {
        // Overwrite the bar (if drawn) with the message; the bar is redrawn at the next update.
        const pad = lastWidth > text.length + label.length + 1 ? ' '.repeat(lastWidth - text.length - label.length - 1) : '';
        o.stream.write(`\r${label} ${text}${pad}\n`);
        lastWidth = 0;
        lastDraw = Number.NEGATIVE_INFINITY;
      } else {
        o.stream.write(`${timestamp(now())} ${label} ${text}\n`);
      }
    },
    finish(done) {
      if (tty) {
        draw(done);
        o.stream.write('\n');
      } else {
        o.stream.write(logLine(done));
      }
    },
  };
}
