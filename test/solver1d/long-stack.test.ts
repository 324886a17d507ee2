/**
 * Long stacks: a band holding more than DEFAULT_STATE_LIMIT bound states is solved for its lowest
 * ones by default, the result says so, and only its lowest LIMITED_TRANSITION_STATES enter
 * transitions, interband pairs only where allowed. Checked on a 61-period GaAs/Al0.3Ga0.7As superlattice against the Kronig–Penney miniband of the infinite
 * superlattice (R. de L. Kronig and W. G. Penney, Proc. R. Soc. A 130, 499 (1931), with the
 * BenDaniel–Duke matching of G. Bastard, Phys. Rev. B 24, 5693 (1981)): its first miniband holds one
 * state per well, all between the band's bottom and top edges.
 */
import { describe, expect, it } from 'vitest';
import { HBAR2_OVER_2M0 as C } from '../../engine/constants.js';
import { buildBandProfile } from '../../engine/profile.js';
import { ALLOWED_OVERLAP2, DEFAULT_STATE_LIMIT, LIMITED_TRANSITION_STATES, settingsOf, solveStructure } from '../../engine/solve.js';
import { countStatesBelow } from '../../engine/solver1d/states.js';
import { parseSpecText } from '../../engine/input/load.js';
import { buildStructure } from '../../engine/structure.js';

const PERIODS = 61;
const spec = parseSpecText([
  'substrate: GaAs', 'temperature: 300 K', 'solver: { nonparabolic: false }', 'stack:',
  ...Array.from({ length: PERIODS }, () => '  - { material: Al0.3Ga0.7As, thickness: 4 nm }\n  - { material: GaAs, thickness: 6 nm }'),
  '  - { material: Al0.3Ga0.7As, thickness: 4 nm }', '',
].join('\n')).spec;
const structure = buildStructure(spec, {});
const settings = settingsOf(spec);

/** cos(qd) of the Kronig–Penney relation for the well (width a, mass mw) and barrier (b, V, mb) at E < V. */
function kpCos(E: number, a: number, b: number, V: number, mw: number, mb: number): number {
  const k = Math.sqrt((mw * E) / C);
  const kap = Math.sqrt((mb * (V - E)) / C);
  const xi = (kap * mw) / (k * mb);
  return Math.cos(k * a) * Math.cosh(kap * b) + 0.5 * (xi - 1 / xi) * Math.sin(k * a) * Math.sinh(kap * b);
}

/** Root of f in [lo, hi] (f(lo), f(hi) of opposite signs) by bisection. */
function bisect(f: (x: number) => number, lo: number, hi: number): number {
  let a = lo;
  let b = hi;
  const fa = f(a);
  for (let i = 0; i < 200; i++) {
    const m = 0.5 * (a + b);
    if ((f(m) > 0) === (fa > 0)) a = m;
    else b = m;
  }
  return 0.5 * (a + b);
}

describe('long stacks: the default state limit', () => {
  const profile = buildBandProfile(structure, 'electron', { maxSlice_nm: 0.2, nonparabolic: false });
  const well = profile.slices[1]!;
  const barrier = profile.slices[0]!;
  const steps: string[] = [];
  const r = solveStructure(structure, settings, { onProgress: (done, total, what) => steps.push(`${done}/${total} ${what}`) });

  it('solves the lowest DEFAULT_STATE_LIMIT electron states, one per well inside the Kronig–Penney first miniband, the rest above it, and says so', () => {
    const V = barrier.V - well.V;
    // First miniband: cos(qd) = +1 at its bottom, −1 at its top (V measured from the well's edge).
    const f = (x: number, t: number): number => kpCos(x, 6, 4, V, well.mass, barrier.mass) - t;
    const bottom = bisect((x) => f(x, 1), 1e-6, 0.3 * V);
    const top = bisect((x) => f(x, -1), bottom, 0.9 * V);
    const e = r.bands.electron;
    expect(e.states.length).toBe(DEFAULT_STATE_LIMIT);
    for (const [k, s] of e.states.entries()) {
      const E = s.energy_eV - well.V;
      if (k < PERIODS) {
        expect(E, `${s.label} at ${E} eV, miniband [${bottom}, ${top}]`).toBeGreaterThanOrEqual(bottom);
        expect(E).toBeLessThanOrEqual(top);
      } else {
        expect(E, `${s.label} at ${E} eV, above the first miniband [${bottom}, ${top}]`).toBeGreaterThan(top);
      }
    }
    // The count sweep: one state per well in the first miniband, more above it.
    expect(e.bound_states).toBe(countStatesBelow(profile, profile.openEdge));
    expect(countStatesBelow(profile, top + well.V + 1e-9)).toBe(PERIODS);
    expect(r.limits?.some((l) => l.startsWith(`electron: the lowest ${DEFAULT_STATE_LIMIT} of its ${e.bound_states} bound states`))).toBe(true);
  });

  it('the limited states are exactly the lowest of an unlimited solve', () => {
    const all = solveStructure(structure, settings, { wavefunctions: false, states: { electron: Infinity, heavy_hole: 0, light_hole: 0 } });
    expect(all.bands.electron.states.length).toBe(r.bands.electron.bound_states);
    expect(r.bands.electron.states.map((s) => s.energy_eV)).toEqual(all.bands.electron.states.slice(0, DEFAULT_STATE_LIMIT).map((s) => s.energy_eV));
    expect(all.limits).toBeUndefined();
  });

  it('lists exactly the interband pairs of the lowest LIMITED_TRANSITION_STATES whose overlap² reaches ALLOWED_OVERLAP2 (overlaps by the trapezoid rule here)', () => {
    const { z_nm: z, psi } = r.wavefunctions;
    const overlap2 = (a: Float64Array, b: Float64Array): number => {
      let s = 0;
      for (let i = 1; i < z.length; i++) s += 0.5 * (a[i - 1]! * b[i - 1]! + a[i]! * b[i]!) * (z[i]! - z[i - 1]!);
      return s * s;
    };
    const listed = new Set(r.transitions.filter((t) => t.kind === 'interband').map((t) => t.label));
    let kept = 0;
    const lowest = (b: 'electron' | 'heavy_hole' | 'light_hole') => r.bands[b].states.slice(0, LIMITED_TRANSITION_STATES);
    expect(r.transitions.every((t) => t.label.split('-').every((l) => Number(/\d+/.exec(l)![0]) <= LIMITED_TRANSITION_STATES)), 'only the lowest states pair').toBe(true);
    for (const hole of ['heavy_hole', 'light_hole'] as const) {
      lowest(hole).forEach((h, j) => lowest('electron').forEach((e, i) => {
        const o2 = overlap2(psi.electron[i]!, psi[hole][j]!);
        // Pairs within 1 % of the threshold could fall either side of it between the two rules.
        if (Math.abs(o2 / ALLOWED_OVERLAP2 - 1) < 0.01) return;
        expect(listed.has(`${e.label}-${h.label}`), `${e.label}-${h.label}: overlap² ${o2}`).toBe(o2 >= ALLOWED_OVERLAP2);
        if (o2 >= ALLOWED_OVERLAP2) kept++;
      }));
    }
    expect(kept).toBeGreaterThan(0);
    expect(kept).toBeLessThan(2 * LIMITED_TRANSITION_STATES * LIMITED_TRANSITION_STATES);
  });

  it('reports its progress band by band, then the transitions', () => {
    expect(steps).toEqual(['1/4 electron states', '2/4 heavy_hole states', '3/4 light_hole states', '4/4 transitions']);
  });

  it('a limit the caller asks for replaces the default, and is not reported as one', () => {
    const asked = solveStructure(structure, { ...settings, maxStates: 70 }, { wavefunctions: false });
    expect(asked.bands.electron.states.length).toBe(70);
    expect(asked.bands.electron.bound_states).toBeUndefined();
    expect(asked.limits).toBeUndefined();
  });
});
