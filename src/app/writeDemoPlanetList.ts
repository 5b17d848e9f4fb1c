/**
 * Writes the invented demo planet list, scenarios/demo-planets.csv (300 rows,
 * src/rank/demoPlanets.ts): `npm run demo:planets`. test/rank/demoPlanets.test.ts
 * checks that the committed file is this output.
 */
import { writeFileAtomic } from '../io/atomicWrite.js';
import { demoPlanetCsv } from '../rank/demoPlanets.js';

export const DEMO_PLANETS_PATH = 'scenarios/demo-planets.csv';
export const DEMO_PLANETS_COUNT = 300;

writeFileAtomic(process.argv[2] ?? DEMO_PLANETS_PATH, demoPlanetCsv(DEMO_PLANETS_COUNT));
