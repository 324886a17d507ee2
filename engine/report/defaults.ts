/** Defaults and table thresholds of the report, kept free of imports so the CLI can show them without loading the plotting stack. */

/** Monte Carlo samples of `report --tolerance` unless --samples says otherwise: p5/p95 to about ±1 % of the samples. */
export const REPORT_SAMPLES = 500;

/** Interband pairs with a smaller envelope overlap² are (nearly) forbidden and left out of the transition tables. */
export const MIN_OVERLAP2 = 0.05;
/** Intersubband pairs with a smaller oscillator strength are left out of the transition tables. */
export const MIN_OSCILLATOR_STRENGTH = 0.01;
