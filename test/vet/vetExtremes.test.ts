/**
 * Legal-but-extreme and malformed claims, end to end through `moonsieve vet`: honest answers
 * or one clear message per problem (field, row, value, what is allowed), never a crash or NaN.
 */
import { describe, it, expect } from 'vitest';
import { Command } from 'commander';
import { mkdtempSync, writeFileSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { registerVet } from '../../src/cli/vetCommand.js';
import { InputError } from '../../src/scenario/errors.js';
import { CLAIM_KEYS } from '../../src/vet/loadClaim.js';
import { nonFinitePaths } from './nonFinite.js';

async function run(args: string[]) {
  let out = '';
  const io = { out: (t: string) => { out += t; }, err: () => {} };
  const program = new Command().exitOverride();
  registerVet(program, io);
  await program.parseAsync(['node', 'moonsieve', 'vet', ...args]);
  return out;
}

// An invented system: a 1 Mjup planet on a 7.25-day orbit of a Sun-like star.
const system = `name: Invented Brask c
star: {mass: 1 Msun, radius: 1 Rsun, teff: 5700 K, limb_darkening: {u1: 0.4, u2: 0.25}}
planet: {mass: 1 Mjup, radius: 1 Rjup, period: 7.25 d, impact_parameter: 0.2}
`;

function claimDir(claimBlock: string, table?: string): string {
  const dir = mkdtempSync(join(tmpdir(), 'ms-vet-x-'));
  writeFileSync(join(dir, 'claim.yaml'), system + 'claim:\n' + claimBlock);
  if (table !== undefined) writeFileSync(join(dir, 't.csv'), table);
  return dir;
}

async function message(dir: string): Promise<string> {
  try {
    await run([join(dir, 'claim.yaml')]);
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return (e as Error).message;
  }
  throw new Error('expected an InputError');
}

const tableClaim = '  table: t.csv\n  time_standard: BJD_TDB\n';
const linear = (n: number, extra = '') => 'time,time_err [min]' + extra + '\n' + Array.from({ length: n }, (_, e) => `${(2459000.5 + 7.25 * e).toFixed(6)},1.0`).join('\n') + '\n';

describe('vet on extreme and malformed claims', () => {
  it('times exactly on a linear ephemeris: no detectable signal, no implied moon, no NaN in the text or JSON', async () => {
    const dir = claimDir(tableClaim, linear(12));
    const text = await run([join(dir, 'claim.yaml')]);
    expect(text).toMatch(/VERDICT: NO SIGNAL/);
    expect(text).toMatch(/Implied moon: none/);
    expect(text).not.toMatch(/NaN|Infinity|IMPLAUSIBLE/);
    const r = JSON.parse(await run([join(dir, 'claim.yaml'), '--json']));
    expect(r.verdict).toBe('no_signal');
    expect(r.implied).toBeNull();
    expect(nonFinitePaths(r)).toEqual([]);
    expect(r.checks.filter((c: { status: string }) => c.status === 'pass' || c.status === 'tension').map((c: { id: string }) => c.id)).toEqual(['residual-noise']);
  });

  it('amplitudes below 3σ are no detectable signal, not a moon', async () => {
    const dir = claimDir('  ttv: {amplitude: 20 s, uncertainty: 10 s, kind: rms}\n  transits: 20\n');
    const r = JSON.parse(await run([join(dir, 'claim.yaml'), '--json']));
    expect(r.verdict).toBe('no_signal');
    expect(r.reasons[0]).toMatch(/^NO SIGNAL .*TTV amplitude 2\.00σ/);
  });

  it('time_err of 1e308, 0, -1, NaN and Infinity are field errors naming the row; nothing is written', async () => {
    for (const [bad, why] of [['1e308', /got "1e308 min"; expected from 1 ms to a quarter of planet\.period/], ['0', /a zero uncertainty/], ['-1', /a negative uncertainty/], ['NaN', /expected a finite number/], ['Infinity', /expected a finite number/]] as const) {
      const table = linear(8).replace(/\n(2459036\.750000),1\.0\n/, `\n$1,${bad}\n`);
      const dir = claimDir(tableClaim, table);
      const msg = await message(dir);
      expect(msg).toMatch(/t\.csv row 6 \(line 7\), column 2 \(time_err\)/);
      expect(msg).toMatch(why);
      expect(readdirSync(dir).sort()).toEqual(['claim.yaml', 't.csv']);
    }
  });

  it('one and two rows say why six are needed; unsorted rows are vetted in time order and say so', async () => {
    for (const n of [1, 2]) expect(await message(claimDir(tableClaim, linear(n)))).toMatch(new RegExp(`got "${n} data rows?"; at least 6 transits`));
    const lines = linear(10).trim().split('\n');
    const shuffled = [lines[0], ...lines.slice(1).reverse()].join('\n') + '\n';
    const r = JSON.parse(await run([join(claimDir(tableClaim, shuffled), 'claim.yaml'), '--json']));
    expect(r.verdict).toBe('no_signal');
    expect(r.assumptions.some((a: string) => /not in time order: they were sorted by time/.test(a))).toBe(true);
  });

  it('an unknown claim key lists every allowed key of the block', async () => {
    const msg = await message(claimDir('  ttv: {amplitude: 2 min, uncertainty: 0.2 min, kind: rms}\n  transits: 10\n  colour: red\n'));
    expect(msg).toMatch(/claim\.colour \(line \d+\): got "red"; unknown key; allowed keys here: /);
    for (const k of CLAIM_KEYS.claim) expect(msg).toContain(k);
  });

  it('an amplitude of 1e308 s is refused with the bound and its reason', async () => {
    const msg = await message(claimDir('  ttv: {amplitude: 1e308 s, uncertainty: 1 s, kind: rms}\n  transits: 10\n'));
    expect(msg).toMatch(/claim\.ttv\.amplitude \(line \d+\): got "1e308 s"; must be a positive time shorter than a quarter of planet\.period \(1\.81 d\)/);
  });
});
