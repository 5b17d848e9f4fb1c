/**
 * The sweep report in headless Chromium (Debian's package, driven by
 * playwright-core; no browser is ever downloaded). Checks: the page loads
 * from a file:// URL with every non-file request blocked, raises no console
 * errors, draws every plot, and the channel selector changes the map's z.
 * A screenshot goes to a temporary folder, never into the repository.
 * Expected values are the report's own contracts (common practice, no source).
 */
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { existsSync, mkdtempSync, writeFileSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type Browser } from 'playwright-core';
import { runTinySweep, type TinySweep } from './tinySweep.js';
import { renderSweepReport } from '../../src/app/sweepReport.js';

const CHROMIUM = '/usr/bin/chromium';
const haveChromium = existsSync(CHROMIUM);
if (!haveChromium) {
  console.warn(`browser test skipped: ${CHROMIUM} is absent (install Debian's chromium package; .ci/run does)`);
}

const EVIL_NAME = 'Quillon b <script>window.__pwned = 1</script> & "friends"';

describe.skipIf(!haveChromium)('sweep report in headless Chromium', () => {
  let browser: Browser;
  let sweep: TinySweep;
  let htmlPath: string;
  const shotDir = mkdtempSync(join(tmpdir(), 'moonsieve-shot-'));

  beforeAll(async () => {
    sweep = await runTinySweep({ name: EVIL_NAME });
    const html = renderSweepReport({ meta: sweep.meta, cells: sweep.cells, runInfo: sweep.runInfo, scenario: sweep.doc });
    htmlPath = join(sweep.dir, 'report.html');
    writeFileSync(htmlPath, html);
    browser = await chromium.launch({
      executablePath: CHROMIUM,
      args: ['--no-sandbox', '--headless', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
  }, 90_000);

  afterAll(async () => {
    await browser?.close();
  });

  it('loads offline, draws every plot, escapes the name, and the channel selector changes the map', async () => {
    const page = await browser.newPage({ viewport: { width: 1200, height: 900 } });
    const errors: string[] = [];
    const blocked: string[] = [];
    page.on('console', (m) => {
      if (m.type() === 'error') errors.push(m.text());
    });
    page.on('pageerror', (e) => errors.push(e.message));
    await page.route('**/*', (route) => {
      const url = route.request().url();
      if (url.startsWith('file:')) return route.continue();
      blocked.push(url);
      return route.abort();
    });
    await page.goto(pathToFileURL(htmlPath).href, { waitUntil: 'load' });
    await page.waitForFunction(() => {
      const plots = [...document.querySelectorAll('.plot')];
      return plots.length > 0 && plots.every((d) => d.querySelector('.main-svg') !== null);
    }, undefined, { timeout: 30_000 });

    // Every plot div rendered an SVG; the expected ones are all there.
    const ids = await page.evaluate(() => [...document.querySelectorAll('.plot')].map((d) => d.id));
    for (const id of ['map', 'mindet', 'mcdiff', 'ex0-lc', 'ex0-timing']) expect(ids).toContain(id);
    const drawn = await page.evaluate(() => [...document.querySelectorAll('.plot')].filter((d) => d.querySelectorAll('.main-svg').length > 0 && d.querySelector('.plot-container')).length);
    expect(drawn).toBe(ids.length);
    // The heatmap image of the map is really painted.
    expect(await page.locator('#map .hm image, #map .heatmaplayer image').count()).toBeGreaterThan(0);

    // User text is shown as text, never run.
    expect(await page.evaluate(() => (window as unknown as { __pwned?: number }).__pwned)).toBeUndefined();
    expect(await page.locator('h1').textContent()).toContain('<script>window.__pwned = 1</script>');

    // The channel selector: combined → TTV → TDV changes the heatmap's z.
    const z = () => page.evaluate(() => JSON.stringify((document.getElementById('map') as unknown as { data: Array<{ z: unknown }> }).data[0].z));
    const zCombined = await z();
    const expected = await page.evaluate(() => (window as unknown as { moonsieveMap: { z: Record<string, unknown> } }).moonsieveMap.z);
    expect(zCombined).toBe(JSON.stringify(expected.combined));
    await page.click('#channel-select button[data-channel="tdv"]');
    await page.waitForFunction((before) => JSON.stringify((document.getElementById('map') as unknown as { data: Array<{ z: unknown }> }).data[0].z) !== before, zCombined);
    const zTdv = await z();
    expect(zTdv).toBe(JSON.stringify(expected.tdv));
    expect(zTdv).not.toBe(zCombined);
    expect(await page.locator('#channel-select button[data-channel="tdv"]').getAttribute('aria-pressed')).toBe('true');
    expect(await page.locator('#map .gtitle').textContent()).toContain('TDV');

    const shot = join(shotDir, 'report.png');
    await page.screenshot({ path: shot, fullPage: true });
    expect(statSync(shot).size).toBeGreaterThan(10_000);
    expect(errors).toEqual([]);
    expect(blocked).toEqual([]);
    await page.close();
  });
});
