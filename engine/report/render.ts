/** Vega-Lite specs rendered to standalone SVG text in Node, with no browser and no canvas. */
import * as vega from 'vega';
import { compile, type TopLevelSpec } from 'vega-lite';
import { PALETTE } from './palette.js';

/** Axis, legend and title styling shared by every plot of a report. */
export const PLOT_CONFIG = {
  font: 'DejaVu Sans, Helvetica, Arial, sans-serif',
  // Tick labels that would touch are dropped (greedy, with a gap): the renderer only estimates text widths.
  axis: { labelColor: PALETTE.ink, titleColor: PALETTE.ink, domainColor: PALETTE.ink, tickColor: PALETTE.ink, gridColor: '#e4e4e4', labelFontSize: 11, titleFontSize: 12, labelOverlap: 'greedy', labelSeparation: 6 },
  legend: { labelColor: PALETTE.ink, titleColor: PALETTE.ink, labelFontSize: 11, titleFontSize: 12, orient: 'bottom' },
  title: { color: PALETTE.ink, fontSize: 13, anchor: 'start' },
  view: { stroke: '#cfcfcf' },
} as const;

/**
 * Renders a Vega-Lite spec to SVG text (the "none" renderer of vega's View: text widths are
 * estimated, which is why titles are kept short).
 */
export async function renderSvg(spec: TopLevelSpec): Promise<string> {
  const view = new vega.View(vega.parse(compile({ ...spec, config: PLOT_CONFIG } as TopLevelSpec).spec), { renderer: 'none' });
  try {
    return await view.toSVG();
  } finally {
    view.finalize();
  }
}
