#!/usr/bin/env node
// Entry point: the compiled CLI lives in dist/ (built by `npm run build`,
// which `npm ci` runs through the `prepare` script).
import { main } from '../dist/src/cli/main.js';

// A closed pipe (`moonsieve limits … | head`) is not an error.
process.stdout.on('error', (e) => {
  if (e.code === 'EPIPE') process.exit(0);
  throw e;
});

main(process.argv).then((code) => {
  process.exitCode = code;
});
