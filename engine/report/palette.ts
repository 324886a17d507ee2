/**
 * The report's colours, in one place. Six colours of our own choosing, picked so that every pair
 * stays at least ΔE*ab ≈ 22 apart for normal vision and under simulated deuteranopia and
 * protanopia (test/report/palette.test.ts checks it), and so that the three bands keep the same
 * colour in every plot of a report.
 */
export const PALETTE = {
  /** Dark indigo: electrons, the first data series. */
  indigo: '#1d4e89',
  /** Amber: heavy holes. */
  amber: '#e08a1e',
  /** Rose: light holes. */
  rose: '#d0508a',
  /** Sky: envelopes and reference curves (bulk DOS, target lines). */
  sky: '#67c1ee',
  /** Ink: axes, text, neutral series. */
  ink: '#3a3a3a',
  /** Straw: windows and highlighted ranges (drawn translucent). */
  straw: '#f5e35a',
} as const;

export type PaletteName = keyof typeof PALETTE;

/** Colour of each band's series, shared by every plot. */
export const BAND_COLOURS = {
  electron: PALETTE.indigo,
  heavy_hole: PALETTE.amber,
  light_hole: PALETTE.rose,
} as const;

/** Human names of the bands for legends. */
export const BAND_NAMES = {
  electron: 'electron (Ec)',
  heavy_hole: 'heavy hole (Ehh)',
  light_hole: 'light hole (Elh)',
} as const;
