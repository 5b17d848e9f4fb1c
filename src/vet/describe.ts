/** Short human-readable renderings of SI numbers for vetting reports. */
import { M_EARTH_KG } from '../physics/constants.js';

/** Three significant digits, exponent form outside 1e-3 … 1e5. */
export function sig3(x: number): string {
  // Unbounded values (e.g. the mass of a moon that cannot make the signal) read as ∞, never "Infinity" or "NaN".
  if (Number.isNaN(x)) return 'n/a';
  if (!Number.isFinite(x)) return x > 0 ? '∞' : '−∞';
  return Math.abs(x) >= 1e5 || (Math.abs(x) < 1e-3 && x !== 0) ? x.toExponential(2) : x.toPrecision(3);
}

export function earthMasses(kg: number): string {
  return `${sig3(kg / M_EARTH_KG)} Mearth`;
}

export function planetRadii(m: number, planetRadiusM: number): string {
  return `${sig3(m / planetRadiusM)} Rp`;
}

export function timeText(s: number): string {
  const a = Math.abs(s);
  if (a >= 2 * 86400) return `${sig3(s / 86400)} d`;
  if (a >= 2 * 3600) return `${sig3(s / 3600)} h`;
  if (a >= 120) return `${sig3(s / 60)} min`;
  return `${sig3(s)} s`;
}

export function percent(p: number): string {
  return `${sig3(100 * p)} %`;
}
