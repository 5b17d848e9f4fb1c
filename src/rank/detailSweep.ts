/**
 * A ranked planet's detail: the planet's own scenario (the row's document)
 * with a small moon mass × separation sweep block, run by `moonsieve sweep`
 * (for the top planets by `rank --detail`, or by hand with the command the
 * page shows), and the folder it goes in. Pure: src/app/rankDetails.ts writes.
 */
import type { ScenarioDocument } from '../scenario/types.js';
import { M_EARTH_KG } from '../physics/constants.js';

/** Grid of a detail sweep: masses × separations, realizations per cell (small: seconds per planet, see docs/rank.md). */
export const DETAIL_MASSES = 6;
export const DETAIL_SEPARATIONS = 6;
export const DETAIL_REALIZATIONS = 20;
/** Longest slug kept from a planet name. */
const SLUG_MAX = 48;

/**
 * The folder of a planet's detail under `details/`: `row<row>-<slug>`, the
 * slug being the name lower-cased with every run of characters other than
 * a–z, 0–9, `.`, `_` and `-` replaced by `-`, with no leading `.` or `-`.
 * No `/`, `\` or leading dot can remain, so no name reaches outside
 * `details/` ("common practice, no source"); the row number keeps two names
 * that slug alike apart (rows are unique in a list).
 */
export function detailFolderName(row: number, name: string): string {
  const slug = name
    .normalize('NFKD')
    .toLowerCase()
    .replace(/[^a-z0-9._-]+/g, '-')
    .replace(/^[.-]+/, '')
    .replace(/[.-]+$/, '')
    .slice(0, SLUG_MAX)
    .replace(/[.-]+$/, '');
  return slug ? `row${row}-${slug}` : `row${row}`;
}

/** Relative path (POSIX separators) of a planet's detail folder inside the rank folder. */
export const detailDir = (row: number, name: string): string => `details/${detailFolderName(row, name)}`;

const mearth = (kg: number): string => `${Number((kg / M_EARTH_KG).toPrecision(3))} Mearth`;

/**
 * The mass axis of a detail sweep: around the planet's smallest forecast
 * moon mass `bestKg` (from a quarter of it to eight times it, so the
 * detection edge lies inside the grid), or 0.1–10 Mearth when the forecast
 * found none. Log spacing.
 */
export function detailMassRange(bestKg: number | null): [string, string] {
  if (bestKg === null || !(bestKg > 0)) return ['0.1 Mearth', '10 Mearth'];
  return [mearth(bestKg / 4), mearth(bestKg * 8)];
}

/**
 * The planet's scenario document with the detail sweep block: moon mass (log)
 * × separation from the Roche limit to the stable limit (linear), as the
 * sweep's own default axes; a copy, `rowDoc` is not changed.
 */
export function detailDocument(rowDoc: ScenarioDocument, bestKg: number | null): ScenarioDocument {
  const doc = structuredClone(rowDoc) as Record<string, unknown>;
  const [from, to] = detailMassRange(bestKg);
  doc.sweep = {
    realizations: DETAIL_REALIZATIONS,
    axes: [
      { field: 'moon.mass', from, to, count: DETAIL_MASSES, spacing: 'log' },
      { field: 'moon.separation', from: 'roche', to: 'stable', count: DETAIL_SEPARATIONS, spacing: 'linear' },
    ],
  };
  return doc as ScenarioDocument;
}

/** The command that makes a planet's detail report from the rank folder. */
export const detailCommand = (dir: string): string => `moonsieve sweep ${dir}/scenario.yaml --out ${dir}`;
