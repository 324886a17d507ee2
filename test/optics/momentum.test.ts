/**
 * Polarisation factors of hole states (engine/optics/momentum.ts) and the valence projections they
 * are built from (engine/valence/dispersion.ts `project`).
 *
 * - Pure components of the T(φ) basis: heavy hole TE 3/2, TM 0; light hole 1/2, 2; split-off 1, 1
 *   (S. L. Chuang, Physics of Optoelectronic Devices, Table 9.1, from memory), at every φ.
 * - Bulk GaAs states at k∥ ≠ 0 against test/reference/optics/bulk_polarisation.py, which builds the
 *   Luttinger Hamiltonian in the orbital ⊗ spin basis with numpy and sums |v_X|², |v_Y|², |v_Z|² of
 *   each Kramers pair: a different basis, spin–orbit from L·σ instead of Clebsch–Gordan tables.
 * - A well symmetric about its centre: the mirror-image shortcut of the valence solver (one block
 *   solved) gives the same characters and factors for both branches as solving both blocks.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { symmetricEigen } from '../../engine/solver2d/dense.js';
import { pointCoefficients, type ValenceModel } from '../../engine/valence/hamiltonian.js';
import { valenceSubbands } from '../../engine/valence/dispersion.js';
import { polarisationFactors } from '../../engine/optics/momentum.js';
import { expectClose } from '../observables/close.js';
import { solvedStack } from './helpers.js';

interface Fixture {
  readonly material: { g1: number; g2: number; g3: number; Dso: number };
  readonly cases: readonly { model: ValenceModel; phi_deg: number; k_per_nm: number; pairs: { energy_eV: number; te: number; tm: number }[] }[];
}
const fx = JSON.parse(readFileSync(new URL('../reference/optics/bulk_polarisation.json', import.meta.url), 'utf8')) as Fixture;

describe('factors of the pure basis components', () => {
  it.each([0, 0.3, Math.PI / 4, 1.1])('at φ = %s rad: hh 3/2, 0; lh 1/2, 2; so 1, 1 (kp6)', (phi) => {
    const expected = [[1.5, 0], [0.5, 2], [0.5, 2], [1.5, 0], [1, 1], [1, 1]];
    for (const model of ['kp4', 'kp6'] as const) {
      const d = model === 'kp4' ? 4 : 6;
      for (let c = 0; c < d; c++) {
        const a = new Float64Array(d);
        a[c] = 1;
        const f = polarisationFactors(model, phi, a);
        expectClose(f.te, expected[c]![0]!, { abs: 1e-12 }, `${model} component ${c} TE at φ = ${phi}`);
        expectClose(f.tm, expected[c]![1]!, { abs: 1e-12 }, `${model} component ${c} TM at φ = ${phi}`);
      }
    }
  });
});

describe('bulk GaAs states against the orbital-basis reference', () => {
  it.each(fx.cases.map((c) => [c.model, c.phi_deg, c.k_per_nm, c] as const))('%s, φ = %s°, k = %s 1/nm: energies and Kramers-pair TE, TM to 1e-9', (model, phiDeg, k, c) => {
    const m = fx.material;
    const phi = (phiDeg * Math.PI) / 180;
    const coef = pointCoefficients({ Ehh: 0, Elh: 0, gamma1: m.g1, gamma2: m.g2, gamma3: m.g3, Dso: m.Dso, Qe: 0 }, model, phi, false);
    const d = coef.d;
    const H = coef.A0.map((v, i) => v + k * k * coef.A2[i]!);
    const eig = symmetricEigen(H, d);
    // Highest first, in Kramers pairs.
    const order = Array.from({ length: d }, (_, i) => d - 1 - i);
    c.pairs.forEach((p, j) => {
      let te = 0;
      let tm = 0;
      for (const s of [order[2 * j]!, order[2 * j + 1]!]) {
        const v = Array.from({ length: d }, (_, r) => eig.vectors[r * d + s]!);
        const f = polarisationFactors(model, phi, v);
        te += f.te;
        tm += f.tm;
      }
      expectClose(eig.values[order[2 * j]!]!, p.energy_eV, { abs: 1e-9 }, `${model} pair ${j} energy`);
      expectClose(te, p.te, { abs: 1e-9 }, `${model} pair ${j} TE`);
      expectClose(tm, p.tm, { abs: 1e-9 }, `${model} pair ${j} TM`);
    });
  });
});

describe('projections in a symmetric well', () => {
  it('the mirror-image shortcut gives both branches the characters and factors of the full two-block solve', () => {
    const r = solvedStack([['Al0.3Ga0.7As', 20], ['GaAs', 8], ['Al0.3Ga0.7As', 20]]);
    const psi = r.wavefunctions.psi.electron;
    const opts = { kPoints: 9, kMax_per_nm: 0.8, subbands: 4, directions: ['[100]', '[110]'] as ('[100]' | '[110]')[], project: { z_nm: r.wavefunctions.z_nm, functions: psi } };
    const once = valenceSubbands(r.structure, opts);
    const both = valenceSubbands(r.structure, { ...opts, bothBlocks: true });
    let worst = 0;
    once.directions.forEach((dir, di) => dir.subbands.forEach((sb, j) => {
      const full = both.directions[di]!.subbands[j]!;
      for (const b of [0, 1] as const) {
        for (let i = 0; i < 9; i++) {
          expectClose(sb.hh[b][i]!, full.hh[b][i]!, { abs: 1e-6 }, `${dir.name} ${sb.label} branch ${b} hh character at k ${i}`);
          for (let n = 0; n < psi.length; n++) {
            const f = (x: typeof sb): { te: number; tm: number } => polarisationFactors('kp4', dir.angle_rad, x.projections![b][n]!.map((c) => c[i]!));
            const a = f(sb);
            const e = f(full);
            // The eigenvectors carry a residual of 1e-5 eV (banded.ts), so factors agree to about 1e-6 of their scale.
            expectClose(a.te, e.te, { abs: 1e-5 }, `${dir.name} e${n + 1}-${sb.label} branch ${b} TE at k ${i}`);
            expectClose(a.tm, e.tm, { abs: 1e-5 }, `${dir.name} e${n + 1}-${sb.label} branch ${b} TM at k ${i}`);
            worst = Math.max(worst, Math.abs(a.te - e.te), Math.abs(a.tm - e.tm));
          }
        }
      }
    }));
    console.log(`largest factor difference, mirror shortcut vs both blocks: ${worst.toExponential(2)}`);
    expect(once.factorisations).toBeLessThan(both.factorisations);
  });
});
