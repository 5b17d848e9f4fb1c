/**
 * Progress output with a fake clock: plain timestamped lines when not on a
 * terminal (every 10 % or 30 s), a redrawn line (\r, ≤ 5 per second) on one.
 * Expected numbers are worked by hand ("common practice, no source").
 */
import { describe, it, expect } from 'vitest';
import { createProgress, formatDuration } from '../../src/app/sweep/progress.js';

function sink(isTTY: boolean) {
  const chunks: string[] = [];
  return { chunks, stream: { isTTY, write: (t: string) => chunks.push(t) } };
}

describe('progress', () => {
  it('writes timestamped lines every 10 % when not on a terminal', () => {
    let t = Date.UTC(2026, 11, 1, 10, 0, 0);
    const { chunks, stream } = sink(false);
    const p = createProgress({ total: 400, stream, now: () => t });
    for (let done = 1; done <= 120; done++) {
      t += 500; // 2 cells/s
      p.update(done);
    }
    // Start line, then 10 % (40 cells) and 20 % (80 cells) and 30 % (120 cells).
    expect(chunks.length).toBe(4);
    expect(chunks[0]).toBe('2026-12-01T10:00:00Z sweep 0/400 cells (0 %), ? cells/s, ~? left\n');
    // 120 cells in 60 s = 2 cells/s; 280 left → 140 s → "2 min".
    expect(chunks[3]).toBe('2026-12-01T10:01:00Z sweep 120/400 cells (30 %), 2.0 cells/s, ~2 min left\n');
    p.finish(120);
    expect(chunks.length).toBe(5);
  });

  it('writes a line every 30 s even between deciles', () => {
    let t = 0;
    const { chunks, stream } = sink(false);
    const p = createProgress({ total: 1000, stream, now: () => t });
    t = 31_000;
    p.update(1); // 0.1 %: only the 30 s rule fires
    expect(chunks.length).toBe(2);
    t = 40_000;
    p.update(2);
    expect(chunks.length).toBe(2);
  });

  it('redraws one line with \\r at most every 200 ms on a terminal, and counts resumed cells', () => {
    let t = 0;
    const { chunks, stream } = sink(true);
    const p = createProgress({ total: 10, initial: 4, stream, now: () => t });
    p.update(5);
    t = 100;
    p.update(6); // throttled
    t = 250;
    p.update(7);
    expect(chunks.length).toBe(2);
    expect(chunks.every((c) => c.startsWith('\r'))).toBe(true);
    // 3 cells of this run in 0.25 s = 12 cells/s; 3 left → 0.25 s.
    expect(chunks[1]).toContain('7/10 cells (70 %), 12.0 cells/s, ~0 s left');
    p.finish(10);
    expect(chunks[chunks.length - 1]).toBe('\n');
  });

  it('is silent with quiet', () => {
    const { chunks, stream } = sink(false);
    const p = createProgress({ total: 10, stream, quiet: true });
    p.update(5);
    p.finish(10);
    expect(chunks).toEqual([]);
  });

  it('formats durations', () => {
    expect(formatDuration(42)).toBe('42 s');
    expect(formatDuration(600)).toBe('10 min');
    expect(formatDuration(3 * 3600)).toBe('3.0 h');
    expect(formatDuration(Number.NaN)).toBe('?');
  });
  it('notes (the calibration phase): a timestamped line in logs; on a terminal a line over the bar, redrawn after', () => {
    const t = Date.UTC(2026, 11, 1, 10, 0, 0);
    const log = sink(false);
    createProgress({ total: 4, stream: log.stream, now: () => t }).note('calibrating false alarms: 20 no-moon realizations');
    expect(log.chunks[1]).toBe('2026-12-01T10:00:00Z sweep calibrating false alarms: 20 no-moon realizations\n');
    let now = 0;
    const tty = sink(true);
    const p = createProgress({ total: 4, stream: tty.stream, now: () => now });
    p.update(1);
    p.note('x');
    now += 1; // within 200 ms of the last draw, but a note forces the next redraw
    p.update(2);
    expect(tty.chunks[1]).toMatch(/^\rsweep x {2,}\n$/); // padded over the longer bar line
    expect(tty.chunks[2]).toMatch(/^\rsweep \[.*\] 2\/4 cells/);
  });
});
