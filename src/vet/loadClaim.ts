/**
 * Reads a claim file (YAML) into a validated `Claim`.
 *
 * Schema: `name`, `seed` (Monte Carlo seed, default 1), `star` and `planet`
 * exactly as in a scenario (same keys, units and defaults), and a `claim:`
 * block with either amplitudes or a table:
 *
 *   claim:
 *     ttv: {amplitude: "2.5 min", uncertainty: "0.4 min", kind: rms}   # kind: rms | semi-amplitude
 *     tdv: {amplitude: "40 s", uncertainty: "12 s", kind: rms}         # ttv and/or tdv
 *     phase_offset: {value: "85 deg", uncertainty: "15 deg"}            # optional: TDV lag behind TTV
 *     transits: 12                                                      # with amplitudes
 *     table: times.csv                                                  # or a table (path relative to the claim file)
 *     time_standard: BJD_TDB                                            # required with a table ("BJD_TDB-2457000" …)
 *     noise: "300 ppm per 2 min"                                        # photometric white noise (for the moon-dip check; old name precision)
 *     cadence: "2 min"                                                  # optional (default: the precision's timescale)
 *     moon_dip: none                                                    # or a claimed depth, e.g. "40 ppm"
 *     duration: "6.2 h"                                                 # optional measured T14 (default: computed)
 *     orientation: isotropic                                            # or coplanar (Monte Carlo prior)
 *     draws: 4000                                                       # Monte Carlo draws
 *     false_alarm: 0.01                                                 # false-alarm level of the signal detection (default 0.01)
 *     companion: moon                                                   # or binary_planet (then the barycentre may lie outside the planet)
 *
 * Ranges (each refused value is reported with its range and the reason): amplitudes and their
 * uncertainties below a quarter of planet.period (uncertainties ≥ 1 ms); precision 0.1 ppm to
 * 1e6 ppm over 1 s to 1 d; cadence 1 s to 1 d; duration 1 min to half of planet.period;
 * moon_dip ≥ 0.01 ppm; phase_offset within ±360°. Tables: 6 to 20 000 rows over at most 50 000
 * orbits (timingTable.ts), files of at most 32 MB.
 */
import { readFileSync, statSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { DAY_S, MINUTE_S } from '../physics/constants.js';
import { InputError, type FieldProblem } from '../scenario/errors.js';
import { FieldReader } from '../scenario/fieldReader.js';
import { parseYamlWithLines, withLines } from '../scenario/loadScenario.js';
import { PLANET_RENAMES, readPlanet, readStar, renamedKeys } from '../scenario/parseScenario.js';
import type { ScenarioCaution } from '../scenario/types.js';
import { parseQuantity } from '../scenario/units.js';
import type { Claim, ClaimedAmplitude, PhotometricPrecision, TimingTable } from './claimTypes.js';
import { MAX_TABLE_ROWS, TIME_STANDARD_ALLOWED, parseTimeStandard, parseTimingTable } from './timingTable.js';

const DEG = Math.PI / 180;
/** Largest table file read, bytes: far above MAX_TABLE_ROWS rows of a few numbers each. */
export const MAX_TABLE_BYTES = 32 * 1024 * 1024;

/** Read a table file, refusing one too large to be a table of transits before reading it. */
function readTableFile(path: string): string {
  const size = statSync(path).size;
  if (size > MAX_TABLE_BYTES) {
    throw new InputError([{ path: 'claim.table', value: `${path} (${(size / 1048576).toFixed(1)} MB)`, allowed: `at most ${MAX_TABLE_BYTES / 1048576} MB: a table of at most ${MAX_TABLE_ROWS} transits is far smaller` }]);
  }
  return readFileSync(path, 'utf8');
}
const DEFAULT_DRAWS = 4000;
/** Default false-alarm level of the signal detection (common practice for a claimed discovery, no source). */
const DEFAULT_FALSE_ALARM = 0.01;

export interface ParseClaimOptions {
  /** Folder against which `claim.table` is resolved (default: the working directory). */
  baseDir?: string;
  /** Reads a table file (default: readFileSync as UTF-8); injectable for tests. */
  readText?: (path: string) => string;
}

/** Keys of each block of a claim file (every one listed when an unknown key is met). */
export const CLAIM_KEYS = {
  top: ['name', 'seed', 'star', 'planet', 'claim'],
  claim: ['ttv', 'tdv', 'phase_offset', 'transits', 'table', 'time_standard', 'noise', 'precision', 'cadence', 'moon_dip', 'duration', 'orientation', 'draws', 'false_alarm', 'companion'],
  amplitude: ['amplitude', 'uncertainty', 'kind'],
  phaseOffset: ['value', 'uncertainty'],
} as const;

/** Smallest noise level and dip depth accepted (0.1 ppm, and 0.01 ppm for a dip): far below any photometry. */
const MIN_FRACTION = 1e-7;
const MIN_DIP = 1e-8;
/** Smallest stated timing uncertainty, s (as for table rows: timingTable.ts MIN_TIME_ERR_S). */
const MIN_UNCERTAINTY_S = 1e-3;
/** Photometric timescales and cadences accepted, s: 1 s to 1 d (the transit model samples the cadence). */
const TIMESCALE_RANGE_S: readonly [number, number] = [1, DAY_S];

function days(s: number): string {
  return `${Number((s / DAY_S).toPrecision(3))} d`;
}

function readAmplitude(r: FieldReader, periodS: number): ClaimedAmplitude {
  const quarter = Number.isFinite(periodS) ? periodS / 4 : Infinity;
  const beyond = Number.isFinite(periodS) ? ` shorter than a quarter of planet.period (${days(quarter)}): a larger timing variation cannot be told apart from a different transit` : '';
  const valueS = r.quantity('amplitude', 'time', { bare: [1, 'seconds'], min: 0, minExclusive: true, max: quarter, maxExclusive: true, rangeText: `must be a positive time${beyond}, e.g. "2.5 min"` });
  const errorS = r.quantity('uncertainty', 'time', { bare: [1, 'seconds'], min: MIN_UNCERTAINTY_S, max: quarter, maxExclusive: true, rangeText: `must be a time (1σ) of at least 1 ms${beyond ? ` and${beyond}` : ''}, e.g. "0.4 min"` });
  let kind: ClaimedAmplitude['kind'] = 'rms';
  const rawKind = r.raw('kind');
  if (rawKind === undefined || rawKind === null) r.problem('kind', rawKind, 'required: "rms" or "semi-amplitude" (they differ by √2 for a sinusoid)');
  else kind = r.choice('kind', ['rms', 'semi-amplitude'] as const, 'rms');
  r.rejectUnknown(CLAIM_KEYS.amplitude);
  return { valueS, errorS, kind };
}

/**
 * The photometric white noise, `claim.noise` (as `instrument.noise` in a scenario); its old name
 * `claim.precision` is read for one release with a note in `deprecations`.
 */
function readPrecision(r: FieldReader, deprecations: string[]): PhotometricPrecision | null {
  const old = r.raw('precision');
  const now = r.raw('noise');
  const hasOld = old !== undefined && old !== null;
  const hasNow = now !== undefined && now !== null;
  if (hasOld && hasNow) {
    r.problem('precision', old, 'give claim.noise only (claim.precision is its old name)');
    return null;
  }
  if (hasOld) deprecations.push('claim.precision: deprecated name: write claim.noise (the old name is accepted in this release only)');
  const key = hasOld ? 'precision' : 'noise';
  const raw = hasOld ? old : now;
  if (raw === undefined || raw === null) return null;
  const allowed = 'expected a white-noise level (0.1 ppm to 1e6 ppm) with its timescale (1 s to 1 d), e.g. "300 ppm per 2 min"';
  if (typeof raw !== 'string' || !/\sper\s/.test(raw)) {
    r.problem(key, raw, allowed);
    return null;
  }
  const [level, scale] = raw.split(/\s+per\s+/);
  try {
    const noiseFraction = parseQuantity(level, r.path(key), 'fraction');
    const noiseTimescaleS = parseQuantity(scale, r.path(key), 'time');
    if (!(noiseFraction >= MIN_FRACTION && noiseFraction <= 1) || !(noiseTimescaleS >= TIMESCALE_RANGE_S[0] && noiseTimescaleS <= TIMESCALE_RANGE_S[1])) throw new Error('range');
    return { noiseFraction, noiseTimescaleS };
  } catch {
    r.problem(key, raw, allowed);
    return null;
  }
}

/** Validate a parsed claim document. `source` names it in messages. */
export function parseClaim(doc: unknown, source = 'claim', opts: ParseClaimOptions = {}): Claim {
  const problems: FieldProblem[] = [];
  const top = new FieldReader(doc, '', problems);
  const name = top.string('name', 'unnamed claim');
  const seed = top.number('seed', { default: 1, min: 0, max: 2 ** 32 - 1, integer: true, rangeText: 'expected an integer from 0 to 4294967295' });
  if (!top.has('star')) problems.push({ path: 'star', value: undefined, allowed: 'required: the host star (mass, radius, teff, limb_darkening)' });
  if (!top.has('planet')) problems.push({ path: 'planet', value: undefined, allowed: 'required: the transiting planet (mass, radius, period)' });
  if (!top.has('claim')) problems.push({ path: 'claim', value: undefined, allowed: 'required: the claimed signal (ttv/tdv amplitudes or a table of transit times)' });
  const star = readStar(new FieldReader(top.raw('star'), 'star', problems));
  const renamed: ScenarioCaution[] = [];
  const planet = readPlanet(new FieldReader(renamedKeys(top.raw('planet'), 'planet', PLANET_RENAMES, problems, renamed), 'planet', problems), star, 0);
  const deprecations = renamed.map((c) => `${c.path}: ${c.message}`);
  const c = new FieldReader(top.raw('claim'), 'claim', problems);
  top.rejectUnknown(CLAIM_KEYS.top);
  const ttv = c.has('ttv') ? readAmplitude(new FieldReader(c.raw('ttv'), 'claim.ttv', problems), planet.periodS) : null;
  const tdv = c.has('tdv') ? readAmplitude(new FieldReader(c.raw('tdv'), 'claim.tdv', problems), planet.periodS) : null;
  let phaseOffset: Claim['phaseOffset'] = null;
  if (c.has('phase_offset')) {
    const p = new FieldReader(c.raw('phase_offset'), 'claim.phase_offset', problems);
    const valueRad = p.quantity('value', 'angle', { bare: [DEG, 'degrees'], min: -2 * Math.PI, max: 2 * Math.PI, rangeText: 'expected an angle from -360 deg to 360 deg' });
    const errorRad = p.quantity('uncertainty', 'angle', { bare: [DEG, 'degrees'], min: 1e-3 * DEG, max: 2 * Math.PI, rangeText: 'must be an angle (1σ) from 0.001 deg to 360 deg' });
    p.rejectUnknown(CLAIM_KEYS.phaseOffset);
    phaseOffset = { valueRad, errorRad };
  }
  let moonDipDepth: number | null = null;
  const dipRaw = c.raw('moon_dip');
  if (dipRaw !== undefined && dipRaw !== null && !(typeof dipRaw === 'string' && /^\s*none\s*$/i.test(dipRaw))) {
    moonDipDepth = c.quantity('moon_dip', 'fraction', { min: MIN_DIP, max: 1, rangeText: 'expected a claimed dip depth from 0.01 ppm to 1e6 ppm such as "40 ppm", or none' });
  }
  const precision = readPrecision(c, deprecations);
  const cadenceS = c.has('cadence') ? c.quantity('cadence', 'time', { bare: [MINUTE_S, 'minutes'], min: TIMESCALE_RANGE_S[0], max: TIMESCALE_RANGE_S[1], rangeText: 'must be a time from 1 s to 1 d' }) : null;
  const halfPeriod = Number.isFinite(planet.periodS) ? planet.periodS / 2 : Infinity;
  const durationS = c.has('duration')
    ? c.quantity('duration', 'time', { bare: [DAY_S / 24, 'hours'], min: MINUTE_S, max: halfPeriod, maxExclusive: true, rangeText: `must be a time of at least 1 min${Number.isFinite(halfPeriod) ? ` and shorter than half of planet.period (${days(halfPeriod)}): no transit lasts longer` : ''}` })
    : null;
  const orientation = c.choice('orientation', ['isotropic', 'coplanar'] as const, 'isotropic');
  const falseAlarm = c.number('false_alarm', { default: DEFAULT_FALSE_ALARM, min: 1e-6, max: 0.5, rangeText: 'expected a false-alarm probability from 1e-6 to 0.5, e.g. 0.01' });
  const companion = c.choice('companion', ['moon', 'binary_planet'] as const, 'moon');
  const draws = c.number('draws', { default: DEFAULT_DRAWS, integer: true, min: 200, max: 1_000_000, rangeText: 'expected a whole number of Monte Carlo draws from 200 to 1000000' });

  let table: TimingTable | null = null;
  let transits = NaN;
  const hasTable = c.has('table');
  if (hasTable) {
    if (ttv || tdv) problems.push({ path: 'claim.table', value: c.raw('table'), allowed: 'give either a table of transit times or ttv/tdv amplitudes, not both' });
    if (c.has('transits')) problems.push({ path: 'claim.transits', value: c.raw('transits'), allowed: 'not with a table: the number of transits is the number of rows' });
    c.raw('transits');
    const tablePath = c.raw('table');
    const std = c.raw('time_standard');
    if (std !== undefined && std !== null && parseTimeStandard(std) === null) problems.push({ path: 'claim.time_standard', value: std, allowed: TIME_STANDARD_ALLOWED });
    if (typeof tablePath !== 'string' || tablePath.trim() === '') {
      problems.push({ path: 'claim.table', value: tablePath, allowed: 'expected the path of a CSV or ECSV file of transit times' });
    } else if (problems.length === 0) {
      const full = resolve(opts.baseDir ?? '.', tablePath);
      let text: string;
      try {
        text = (opts.readText ?? readTableFile)(full);
      } catch (e) {
        if (e instanceof InputError) throw e;
        const code = (e as NodeJS.ErrnoException).code;
        const why = code === 'ENOENT' ? `no such file (${full})` : code === 'EISDIR' ? `a folder, not a file (${full})` : `cannot read it (${code ?? String(e)})`;
        throw new InputError([{ path: 'claim.table', value: tablePath, allowed: why }], source);
      }
      table = parseTimingTable(text, tablePath, typeof std === 'string' ? std : null, planet.periodS);
      transits = table.epochs.length;
    }
  } else {
    if (c.has('time_standard')) {
      c.raw('time_standard');
      problems.push({ path: 'claim.time_standard', value: c.raw('time_standard'), allowed: 'only with a table of transit times' });
    }
    if (!ttv && !tdv && top.has('claim')) problems.push({ path: 'claim', value: top.raw('claim'), allowed: 'needs ttv and/or tdv amplitudes ({amplitude, uncertainty, kind}), or a table of transit times' });
    transits = c.number('transits', { integer: true, min: 3, max: 10000, rangeText: 'required with amplitudes: the number of transits behind the claim (3 to 10000)' });
  }
  c.rejectUnknown(CLAIM_KEYS.claim);
  if (problems.length > 0) throw new InputError(problems, source);
  return { name, seed, star, planet, ttv, tdv, phaseOffset, moonDipDepth, precision, cadenceS, transits, durationS, table, orientation, falseAlarm, companion, draws, deprecations };
}

/** Parse claim YAML text; problems carry the line numbers of the YAML nodes. */
export function parseClaimText(text: string, source = 'claim', opts: ParseClaimOptions = {}): Claim {
  const { value, lineOf } = parseYamlWithLines(text, source);
  try {
    return parseClaim(value, source, opts);
  } catch (e) {
    if (e instanceof InputError) throw withLines(e, lineOf, source);
    throw e;
  }
}

/** Read and validate a claim file; a `claim.table` is resolved against the file's folder. */
export function loadClaim(path: string): Claim {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new InputError([{ path: 'CLAIM', value: path, allowed: code === 'ENOENT' ? 'no such file' : `cannot read it (${code ?? String(e)})` }]);
  }
  return parseClaimText(text, path, { baseDir: dirname(resolve(path)) });
}
