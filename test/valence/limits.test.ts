import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { valenceSubbands, type ValenceResult } from '../../engine/valence/dispersion.js';
import { solveStructure } from '../../engine/solve.js';
import { HBAR2_OVER_2M0 } from '../../engine/constants.js';
import { alloyAt, biaxialStrain, edgeShifts, parseFormula } from '../../materials/index.js';
import { expectWithin, stack } from './helpers.js';

/**
 * k∥ = 0 energies Richardson-extrapolated from grids h, h/2, h/4 (the box scheme converges as h²,
 * with h⁴ next: E = (64 E₄ − 20 E₂ + E₁)/45), for each subband with its label.
 */
function zoneCentre(s: Parameters<typeof valenceSubbands>[0], model: 'kp4' | 'kp6', subbands: number, h: number): { label: string; energy: number }[] {
  const runs: ValenceResult[] = [1, 2, 4].map((refine) => valenceSubbands(s, { model, subbands, kPoints: 1, grid_nm: h, refine, outer_nm: 120, directions: ['[100]'], extrapolate: false }));
  return runs[0]!.directions[0]!.subbands.map((sb, j) => {
    const e = runs.map((r) => r.directions[0]!.subbands[j]!.energy_eV[0][0]!);
    return { label: sb.label, energy: (64 * e[2]! - 20 * e[1]! + e[0]!) / 45 };
  });
}

const INNER = fc.oneof(
  fc.double({ min: 0.1, max: 0.4, noNaN: true }).map((x) => `Al${x.toFixed(3)}Ga${(1 - Number(x.toFixed(3))).toFixed(3)}As`),
  fc.double({ min: 0, max: 0.25, noNaN: true }).map((y) => `In${y.toFixed(3)}Ga${(1 - Number(y.toFixed(3))).toFixed(3)}As`),
  fc.constant('GaAs'),
);

describe('k∥ = 0: the multiband subbands are the single-band hh and lh states (the Hamiltonian decouples there)', () => {
  // Single band: engine/solve.ts solveStructure, the exact piecewise solver with ψ and ψ′/m continuous
  // and masses 1/(γ1 − 2γ2), 1/(γ1 + 2γ2) (common practice; Chuang, Physics of Optoelectronic Devices).
  // The outer layers continue outwards in both (padded to 120 nm here); states within 3 meV of the
  // continuum are skipped, their tails reaching the walls.
  it('4×4, random stacks on GaAs: every hh and lh state to 1e-6 eV (property)', () => {
    fc.assert(fc.property(
      fc.array(fc.record({ material: INNER, thickness_nm: fc.double({ min: 2, max: 9, noNaN: true }).map((t) => Number(t.toFixed(2))) }), { minLength: 1, maxLength: 3 }),
      fc.double({ min: 0.25, max: 0.45, noNaN: true }),
      (inner, x) => {
        const barrier = `Al${x.toFixed(2)}Ga${(1 - Number(x.toFixed(2))).toFixed(2)}As`;
        const s = stack([{ material: barrier, thickness_nm: 20 }, ...inner, { material: barrier, thickness_nm: 20 }]);
        const single = solveStructure(s, undefined, { wavefunctions: false });
        const edge = Math.max(single.bands.heavy_hole.barrier_eV, single.bands.light_hole.barrier_eV);
        const wanted = [...single.bands.heavy_hole.states, ...single.bands.light_hole.states].filter((st) => st.energy_eV > edge + 3e-3);
        if (wanted.length === 0) return;
        const all = single.bands.heavy_hole.states.length + single.bands.light_hole.states.length;
        const kp = zoneCentre(s, 'kp4', Math.min(all, 6), 0.2);
        for (const st of wanted) {
          const mine = kp.find((k) => k.label === st.label);
          if (!mine) {
            // Subbands are the highest ones: a lower state may be beyond those asked for.
            expect(kp.length).toBe(Math.min(all, 6));
            continue;
          }
          expectWithin(mine.energy, st.energy_eV, 1e-6, `${st.label} of ${s.layers.map((l) => `${l.formula} ${l.thickness_nm}`).join(' / ')}`);
        }
      },
    ), { numRuns: 8, seed: 20261203 });
  });

  it('6×6: heavy holes exact as well; light holes move by the lh–so coupling of the k_z terms', () => {
    const s = stack([{ material: 'Al0.3Ga0.7As', thickness_nm: 30 }, { material: 'GaAs', thickness_nm: 8 }, { material: 'Al0.3Ga0.7As', thickness_nm: 30 }]);
    const single = solveStructure(s, undefined, { wavefunctions: false });
    const kp = zoneCentre(s, 'kp6', 4, 0.2);
    for (const st of single.bands.heavy_hole.states.slice(0, 3)) expectWithin(kp.find((k) => k.label === st.label)!.energy, st.energy_eV, 1e-6, `kp6 ${st.label}`);
    const lh1 = kp.find((k) => k.label === 'lh1')!.energy - single.bands.light_hole.states[0]!.energy_eV;
    // The split-off coupling √2 Q with Q ∝ γ2 k_z² pushes the confined light hole up by a fraction of a meV.
    expect(Math.abs(lh1)).toBeGreaterThan(1e-5);
    expect(Math.abs(lh1)).toBeLessThan(3e-3);
  });
});

/** max over k_z of the upper bulk band at in-plane (kx, ky): the top of a thick layer's spectrum at k∥. */
function bulkTop(g1: number, g2: number, g3: number, Ev: number, kx: number, ky: number): number {
  const upper = (kz: number): number => {
    const k2 = kx * kx + ky * ky + kz * kz;
    const root = Math.sqrt(4 * g2 * g2 * k2 * k2 + 12 * (g3 * g3 - g2 * g2) * (kx * kx * ky * ky + ky * ky * kz * kz + kz * kz * kx * kx));
    return Ev - HBAR2_OVER_2M0 * (g1 * k2 - root);
  };
  let best = -Infinity;
  for (let i = 0; i <= 4000; i++) best = Math.max(best, upper(i * 2.5e-4));
  return best;
}

describe('bulk limit: a 300 nm layer', () => {
  it('GaAs: top subband = the bulk Luttinger band (closed form, max over k_z) within 0.1 meV up to k∥ = 0.5 1/nm along [100] and [110]', () => {
    const s = stack([{ material: 'GaAs', thickness_nm: 300 }]);
    const r = valenceSubbands(s, { subbands: 1, kPoints: 6, kMax_per_nm: 0.5, grid_nm: 0.25 });
    const p = alloyAt(parseFormula('GaAs'), 300);
    for (const d of r.directions) {
      for (let i = 0; i < r.k_per_nm.length; i++) {
        const k = r.k_per_nm[i]!;
        const expected = bulkTop(p.gamma1, p.gamma2, p.gamma3, p.VBO, k * Math.cos(d.angle_rad), k * Math.sin(d.angle_rad));
        for (const branch of [0, 1] as const) expectWithin(d.subbands[0]!.energy_eV[branch][i]!, expected, 1e-4, `${d.name} k = ${k}`);
      }
    }
  });

  it('strained on GaAs: compressive In0.2Ga0.8As tops at the Bir–Pikus hh edge, tensile GaAs0.85P0.15 at the lh edge (materials/strain.ts edgeShifts), kp4 and kp6', () => {
    const sub = alloyAt(parseFormula('GaAs'), 300).a_nm;
    for (const [formula, band] of [['In0.2Ga0.8As', 'hh'], ['GaAs0.85P0.15', 'lh']] as const) {
      const s = stack([{ material: formula, thickness_nm: 300 }]);
      const p = alloyAt(parseFormula(formula), 300);
      const sh = edgeShifts(p, biaxialStrain(p.a_nm, sub, p.C11, p.C12));
      for (const model of ['kp4', 'kp6'] as const) {
        const top = valenceSubbands(s, { model, subbands: 1, kPoints: 1, grid_nm: 0.5 }).directions[0]!.subbands[0]!;
        expect(top.kind).toBe(band);
        expectWithin(top.energy_eV[0][0]!, p.VBO + (band === 'hh' ? sh.dEhh : sh.dElh), 1e-4, `${formula} ${model} ${band} edge`);
      }
    }
  });
});
