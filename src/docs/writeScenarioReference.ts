/**
 * `npm run docs:scenario`: writes docs/scenario-reference.md from the field
 * table (see scenarioReference.ts). Run from the repository root.
 */
import { resolve } from 'node:path';
import { writeFileAtomic } from '../io/atomicWrite.js';
import { renderScenarioReference } from './scenarioReference.js';

const target = resolve(process.argv[2] ?? 'docs/scenario-reference.md');
writeFileAtomic(target, renderScenarioReference());
process.stdout.write(`wrote ${target}\n`);
