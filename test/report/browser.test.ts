/**
 * Every plot of every report kind, rendered by headless chromium: no console error, every plot
 * drawn at a non-zero size with at least one data mark, no two texts of a plot overlapping
 * (bounding boxes of the rendered SVG's text elements, shrunk by half a pixel for antialiasing),
 * and in a detector's band diagram every state label inside its panel (its level is inside the
 * panel's energy range by construction: test/report/band-diagram.test.ts).
 */
import { describe, expect, it } from 'vitest';
import { existsSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { chromium, type Page } from 'playwright-core';
import { bandDiagramSvg, buildReport, inputFromText, loadReportInput, readCampaign, toleranceReport, campaignSections, type ReportInput } from '../../engine/report/index.js';
import { figureHtml, pageHtml } from '../../engine/report/html.js';
import { loadSpecFile, parseSpecText } from '../../engine/input/load.js';
import { solve } from '../../engine/solve.js';
import { nominalVariables } from '../../engine/structure.js';
import { DEFAULT_TOLERANCE } from '../../engine/tolerance/analyse.js';
import { DETECTOR_SPEC, WELL_SPEC, WIRE_SPEC } from './well-spec.js';
import { referenceRun, tempDir, tinyCampaign } from '../campaign/helpers.js';

const CHROMIUM = '/usr/bin/chromium';
const ARTIFACTS = resolve('test-artifacts');

/** The well with a constraint and a figure besides its window target: the tolerance page then has one histogram of each kind. */
const TOLERANCE_SPEC = `${WELL_SPEC}  - { constraint: critical_thickness }\n  - { maximize: overlap, transition: e1-hh1 }\n`;

interface Overlap { readonly a: string; readonly b: string }

/** In the page: per plot, its size, data marks, overlapping text pairs, and (band diagrams) state texts outside their panel. */
async function inspect(tab: Page): Promise<{ size: [number, number]; marks: number; overlaps: Overlap[]; outside: string[] }[]> {
  return tab.locator('figure.plot svg').evaluateAll((svgs) => svgs.map((svg) => {
    const r = svg.getBoundingClientRect();
    const marks = [...svg.querySelectorAll('.role-mark path, .role-mark line')].filter((p) => (p.getAttribute('d') ?? 'x') !== '' && p.getBoundingClientRect().width + p.getBoundingClientRect().height > 0).length;
    // Texts the renderer hid (opacity 0: tick labels dropped for overlap) are not drawn.
    const texts = [...svg.querySelectorAll('text')].filter((t) => {
      const st = t.ownerDocument.defaultView!.getComputedStyle(t);
      return (t.textContent ?? '').trim() !== '' && st.visibility !== 'hidden' && Number(st.opacity) > 0 && t.getAttribute('opacity') !== '0';
    }).map((t) => ({ text: t.textContent!.trim(), box: t.getBoundingClientRect() })).filter((t) => t.box.width > 0 && t.box.height > 0);
    const overlaps: { a: string; b: string }[] = [];
    const shrink = 0.5;
    for (let i = 0; i < texts.length; i++) {
      for (let j = i + 1; j < texts.length; j++) {
        const a = texts[i]!.box;
        const b = texts[j]!.box;
        if (a.left + shrink < b.right - shrink && b.left + shrink < a.right - shrink && a.top + shrink < b.bottom - shrink && b.top + shrink < a.bottom - shrink) overlaps.push({ a: texts[i]!.text, b: texts[j]!.text });
      }
    }
    // A band diagram's panels: each state label (e1, hh2…) inside the panel's frame.
    const outside: string[] = [];
    for (const group of svg.querySelectorAll('g.role-scope')) {
      if (!/concat_\d+_group/.test(group.getAttribute('class') ?? '')) continue;
      const frame = group.querySelector(':scope > g > path.background')?.getBoundingClientRect();
      if (!frame) continue;
      const inside = (x: number, y: number): boolean => x >= frame.left - 1 && x <= frame.right + 1 && y >= frame.top - 1 && y <= frame.bottom + 1;
      for (const t of group.querySelectorAll('.role-mark text')) {
        if (!/^(e|hh|lh)\d+$/.test((t.textContent ?? '').trim())) continue;
        const b = t.getBoundingClientRect();
        if (!inside(b.left, b.top) || !inside(b.right, b.bottom)) outside.push(`label ${t.textContent}`);
      }
    }
    return { size: [r.width, r.height] as [number, number], marks, overlaps, outside };
  }));
}

describe('report in a browser', () => {
  it('every plot is drawn, has data, and no two of its texts overlap; a detector\'s states lie inside its band diagram', async () => {
    expect(existsSync(CHROMIUM), `${CHROMIUM} is missing: install Debian's chromium with "apt-get update && apt-get install -y chromium" (.ci/run does this)`).toBe(true);
    mkdirSync(ARTIFACTS, { recursive: true });
    const write = async (name: string, html: string | Promise<string>): Promise<string> => { const file = join(ARTIFACTS, name); writeFileSync(file, await html); return file; };
    const spec = parseSpecText(TOLERANCE_SPEC, 'well.yaml').spec;
    const tolerance = await toleranceReport(spec, nominalVariables(spec), { ...DEFAULT_TOLERANCE, samples: 40, workers: 1 });
    const runDir = tempDir('browser-campaign');
    const run = join(runDir, 'tiny.run');
    await referenceRun(tinyCampaign(runDir), run);
    const report = readCampaign(run);
    const campaignPage = pageHtml({ title: 'campaign', meta: [], status: { ok: true, text: '' }, footer: '',
      sections: await campaignSections(report) });
    // Band diagrams of scenarios whose state labels collided in the earlier single-panel diagram (coupled wells, a strained MQW laser, an InP well).
    const scenarios = ['runs/coupled-asymmetric.yaml', 'runs/laser-1300-sc-mqw.yaml', 'runs/telecom-1550-inp.yaml'];
    const diagrams = pageHtml({ title: 'band diagrams of runs/', meta: [], status: { ok: true, text: '' }, footer: '',
      sections: await Promise.all(scenarios.map(async (f, i) => ({ id: `s${i}`, title: f, html: figureHtml(await bandDiagramSvg(solve(loadSpecFile(f).spec)), f) }))) });
    // Plots per page: band diagram, valence dispersion and DOS of a well; with the tolerance section
    // also the sensitivity bars and a histogram per target, constraint and figure; a wire's materials
    // map, |ψ|² maps and 1-D DOS; a campaign's sweep, design curves and achieved − goal.
    const pages = [
      { file: await write('report-well.html', buildReport(inputFromText(WELL_SPEC, 'well.yaml'))), plots: 3 },
      { file: await write('report-well-tolerance.html', buildReport({ ...inputFromText(TOLERANCE_SPEC, 'well.yaml'), tolerance } as ReportInput)), plots: 7 },
      { file: await write('report-wire.html', buildReport(inputFromText(WIRE_SPEC, 'wire.yaml'))), plots: 3 },
      { file: await write('report-campaign.html', campaignPage), plots: 3 },
      { file: await write('report-detector.html', buildReport(inputFromText(DETECTOR_SPEC, 'detector.yaml'))), plots: 3 },
      { file: await write('band-diagrams.html', diagrams), plots: scenarios.length },
      // Gain spectra (TE/TM at several densities), gain–density curve and spontaneous emission after
      // the band diagram, valence dispersion and DOS; a doped detector's self-consistent profile and
      // absorption spectrum after its band diagram and DOS.
      { file: await write('report-optics.html', buildReport(loadReportInput('runs/tm-gain-tensile.yaml'))), plots: 6 },
      { file: await write('report-doped.html', buildReport(loadReportInput('runs/qwip-doped-9um.yaml'))), plots: 4 },
    ];
    expect(loadReportInput(run).kind).toBe('campaign');
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
        const found = await inspect(tab);
        expect(found.length, `plots found in ${file}`).toBe(plots);
        found.forEach((p, k) => {
          expect(p.size[0] > 0 && p.size[1] > 0, `${file} plot ${k + 1}: size ${p.size.join(' × ')}`).toBe(true);
          expect(p.marks, `${file} plot ${k + 1}: data marks drawn`).toBeGreaterThan(0);
          expect(p.overlaps, `${file} plot ${k + 1}: overlapping texts ${p.overlaps.map((o) => `"${o.a}" / "${o.b}"`).join(', ')}`).toEqual([]);
          expect(p.outside, `${file} plot ${k + 1}: state labels outside their panel`).toEqual([]);
        });
        expect(errors, `${file}: console errors: ${errors.join(' | ')}`).toEqual([]);
        await tab.screenshot({ path: file.replace(/\.html$/, '.png'), fullPage: true });
        await tab.close();
      }
    } finally {
      await context.close();
      rmSync(profile, { recursive: true, force: true });
    }
  }, 120_000);
});
