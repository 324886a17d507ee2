/**
 * The test objectives of fixtures.json, written exactly as in generate.py so that both sides
 * evaluate the same numbers.
 */

/** GaAs (001) monolayer a/2 in nm (common practice). */
export const MONOLAYER_NM = 0.2827;

export interface FunctionParams {
  readonly centre?: readonly number[];
  readonly weights?: readonly number[];
  readonly targets?: readonly number[];
}

type TestFunction = (x: readonly number[], p: FunctionParams) => number;

const vector = (v: readonly number[] | undefined, name: string): readonly number[] => {
  if (v === undefined) throw new Error(`fixture parameter "${name}" missing`);
  return v;
};

/** Python's round(): half to even, as numpy.round, so that plateaus match generate.py. */
const roundHalfEven = (v: number): number => {
  const r = Math.round(v);
  return Math.abs(v - Math.trunc(v)) === 0.5 && r % 2 !== 0 ? r - 1 : r;
};

export const TEST_FUNCTIONS: Readonly<Record<string, TestFunction>> = {
  rosenbrock: (x) => {
    let s = 0;
    for (let i = 0; i + 1 < x.length; i += 1) s += 100 * (x[i + 1] - x[i] ** 2) ** 2 + (1 - x[i]) ** 2;
    return s;
  },
  sphere: (x, p) => {
    const c = vector(p.centre, 'centre');
    return x.reduce((s, v, k) => s + (v - c[k]) ** 2, 0);
  },
  beale: ([a, b]) => (1.5 - a + a * b) ** 2 + (2.25 - a + a * b ** 2) ** 2 + (2.625 - a + a * b ** 3) ** 2,
  himmelblau: ([a, b]) => (a * a + b - 11) ** 2 + (a + b * b - 7) ** 2,
  booth: ([a, b]) => (a + 2 * b - 7) ** 2 + (2 * a + b - 5) ** 2,
  'weighted-quadratic': (x, p) => {
    const c = vector(p.centre, 'centre');
    const w = vector(p.weights, 'weights');
    return x.reduce((s, v, k) => s + w[k] * (v - c[k]) ** 2, 0);
  },
  staircase: (x, p) => {
    const t = vector(p.targets, 'targets');
    return x.reduce((s, v, k) => s + (MONOLAYER_NM * roundHalfEven(v / MONOLAYER_NM) - t[k]) ** 2, 0);
  },
};

export interface ScipyRun {
  readonly x: readonly number[];
  readonly f: number;
  readonly evaluations: number;
  readonly iterations: number;
  readonly success: boolean;
}

export interface NelderMeadCase {
  readonly name: string;
  readonly function: string;
  readonly params: FunctionParams;
  readonly x0: readonly number[];
  readonly bounds: readonly (readonly [number, number])[];
  readonly mode: 'bounded' | 'equivalent';
  readonly initialStep: number;
  readonly adaptive: boolean;
  readonly xTolerance: number;
  readonly fTolerance: number;
  readonly maxEvaluations: number;
  readonly knownMinimiser: readonly number[] | null;
  readonly knownMinimum: number | null;
  readonly scipy: ScipyRun;
  /** Objective values in scipy's evaluation order ('equivalent' cases only). */
  readonly scipyTrace?: readonly number[];
}

export const objectiveOf = (c: NelderMeadCase): ((x: readonly number[]) => number) => {
  const fn = TEST_FUNCTIONS[c.function];
  if (fn === undefined) throw new Error(`fixture function "${c.function}" has no TypeScript twin`);
  return (x) => fn(x, c.params);
};
