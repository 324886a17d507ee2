import { describe, expect, it } from 'vitest';
import { existsSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium } from 'playwright-core';
import { buildReport, inputFromText } from '../../engine/report/index.js';
import { WELL_SPEC } from './well-spec.js';

const CHROMIUM = '/usr/bin/chromium';
const ARTIFACTS = resolve('test-artifacts');

describe('report in a browser', () => {
  it('opens with no console error and every plot drawn at a non-zero size', async () => {
    expect(existsSync(CHROMIUM), `${CHROMIUM} is missing: install Debian's chromium with "apt-get update && apt-get install -y chromium" (.ci/run does this)`).toBe(true);
    mkdirSync(ARTIFACTS, { recursive: true });
    const page = join(ARTIFACTS, 'report-well.html');
    writeFileSync(page, await buildReport(inputFromText(WELL_SPEC, 'well.yaml')));
    const profile = mkdtempSync(join(tmpdir(), 'ws-chromium-'));
    const context = await chromium.launchPersistentContext(profile, {
      executablePath: CHROMIUM, headless: true,
      args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
    });
    try {
      const tab = await context.newPage();
      const errors: string[] = [];
      tab.on('console', (m) => { if (m.type() === 'error') errors.push(m.text()); });
      tab.on('pageerror', (e) => errors.push(e.message));
      await tab.setViewportSize({ width: 1200, height: 900 });
      await tab.goto(pathToFileURL(page).href);
      const boxes = await tab.locator('figure.plot svg').evaluateAll((svgs) => svgs.map((s) => { const r = s.getBoundingClientRect(); return [r.width, r.height]; }));
      expect(boxes.length, 'plots found').toBe(2);
      for (const [w, h] of boxes) expect(w! > 0 && h! > 0, `plot size ${w} × ${h}`).toBe(true);
      expect(errors, `console errors: ${errors.join(' | ')}`).toEqual([]);
      await tab.screenshot({ path: join(ARTIFACTS, 'report-well.png'), fullPage: true });
    } finally {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    }
  }, 60_000);
});
