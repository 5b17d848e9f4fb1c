#!/usr/bin/env node
// Entry point: the compiled CLI lives in dist/ (built by `npm run build`,
// which `npm ci` runs through the `prepare` script).
import { main } from '../dist/src/cli/main.js';

main(process.argv).then((code) => {
  process.exitCode = code;
});
