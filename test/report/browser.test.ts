import { describe, expect, it } from 'vitest';
import { existsSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium } from 'playwright-core';
import { buildReport, inputFromText, loadReportInput, toleranceReport, type ReportInput } from '../../engine/report/index.js';
import { parseSpecText } from '../../engine/spec/load.js';
import { nominalVariables } from '../../engine/structure.js';
import { DEFAULT_TOLERANCE } from '../../engine/tolerance/analyse.js';
import { WELL_SPEC, WIRE_SPEC } from './well-spec.js';
import { referenceRun, tempDir, tinyCampaign } from '../campaign/helpers.js';

const CHROMIUM = '/usr/bin/chromium';
const ARTIFACTS = resolve('test-artifacts');

/** Opens each page in headless chromium: no console error, and the expected number of plots, all of non-zero size. */
async function checkPages(pages: readonly { readonly file: string; readonly plots: number }[]): Promise<void> {
  expect(existsSync(CHROMIUM), `${CHROMIUM} is missing: install Debian's chromium with "apt-get update && apt-get install -y chromium" (.ci/run does this)`).toBe(true);
  const profile = mkdtempSync(join(tmpdir(), 'ws-chromium-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM, headless: true,
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  try {
    for (const { file, plots } of pages) {
      const tab = await context.newPage();
      const errors: string[] = [];
      tab.on('console', (m) => { if (m.type() === 'error') errors.push(m.text()); });
      tab.on('pageerror', (e) => errors.push(e.message));
      await tab.setViewportSize({ width: 1200, height: 900 });
      await tab.goto(pathToFileURL(file).href);
      const boxes = await tab.locator('figure.plot svg').evaluateAll((svgs) => svgs.map((s) => { const r = s.getBoundingClientRect(); return [r.width, r.height]; }));
      expect(boxes.length, `plots found in ${file}`).toBe(plots);
      for (const [w, h] of boxes) expect(w! > 0 && h! > 0, `${file}: plot size ${w} × ${h}`).toBe(true);
      expect(errors, `${file}: console errors: ${errors.join(' | ')}`).toEqual([]);
      await tab.screenshot({ path: file.replace(/\.html$/, '.png'), fullPage: true });
      await tab.close();
    }
  } finally {
    await context.close();
    rmSync(profile, { recursive: true, force: true });
  }
}

describe('report in a browser', () => {
  it('opens with no console error and every plot drawn at a non-zero size', async () => {
    mkdirSync(ARTIFACTS, { recursive: true });
    const well = join(ARTIFACTS, 'report-well.html');
    writeFileSync(well, await buildReport(inputFromText(WELL_SPEC, 'well.yaml')));
    const spec = parseSpecText(WELL_SPEC, 'well.yaml').spec;
    const tolerance = await toleranceReport(spec, nominalVariables(spec), { ...DEFAULT_TOLERANCE, samples: 40, workers: 1 });
    const tol = join(ARTIFACTS, 'report-well-tolerance.html');
    writeFileSync(tol, await buildReport({ ...inputFromText(WELL_SPEC, 'well.yaml'), tolerance } as ReportInput));
    const wire = join(ARTIFACTS, 'report-wire.html');
    writeFileSync(wire, await buildReport(inputFromText(WIRE_SPEC, 'wire.yaml')));
    const runDir = tempDir('browser-campaign');
    await referenceRun(tinyCampaign(runDir), join(runDir, 'tiny.run'));
    const campaign = join(ARTIFACTS, 'report-campaign.html');
    writeFileSync(campaign, await buildReport(loadReportInput(join(runDir, 'tiny.run'))));
    // Band diagram and DOS; with the tolerance section also the sensitivity bars and one histogram;
    // a wire: materials map, |ψ|² maps and 1-D DOS; a campaign: achieved versus swept goal.
    await checkPages([{ file: well, plots: 3 }, { file: tol, plots: 5 }, { file: wire, plots: 3 }, { file: campaign, plots: 1 }]);
  }, 60_000);
});
