/** Defaults of the report command, kept free of imports so the CLI can show them without loading the plotting stack. */

/** Monte Carlo samples of `report --tolerance` unless --samples says otherwise: p5/p95 to about ±1 % of the samples. */
export const REPORT_SAMPLES = 500;
