/**
 * Closed-form checks of the gain spectrum (issue 14 acceptance, first line).
 *
 * With parabolic bands and no broadening, the material gain of a well is the 2-D joint density of
 * states of each subband pair — a step at its edge E_nj — times its matrix element and the Fermi
 * inversion factor (common practice; S. L. Chuang, Physics of Optoelectronic Devices, Wiley 1995,
 * Ch. 9; L. A. Coldren and S. W. Corzine, Diode Lasers and Photonic Integrated Circuits, Wiley
 * 1995, Ch. 4; from memory):
 *   g(ħω) = Σ_nj Θ(ħω − E_nj) e² m_r M_nj [f_c(E_c) − f_v(E_v)] / (6 n_r ε0 c ħ² ω L_w),
 * with m_r = (1/m_e + 1/m_h)⁻¹ m0 the reduced in-plane mass, M_nj = (TE or TM factor)·Ep·⟨e_n|h_j⟩²
 * (|ê·p|² summed over both spins = 2·(m0/6)·M), and at ħω the states of k² = (ħω − E_nj) m_r/(ħ²/2m0):
 * E_c = E_n + (ħ²k²/2m0)/m_e, E_v = E_j − (ħ²k²/2m0)/m_h. The quasi-Fermi levels are found here from
 * the closed-form 2-D densities n = Σ (m kT/πħ²) ln(1 + e^((F − E)/kT)) by bisection, independently of
 * the engine's k tables. The factors at the subband edges are TE 3/2, TM 0 for heavy holes and 1/2,
 * 2 for light holes (Chuang, Table 9.1; Coldren and Corzine, App. 8; from memory), checked on the
 * multiband k·p states at k∥ = 0.
 */
import { describe, expect, it } from 'vitest';
import { ELEMENTARY_CHARGE_C, EPSILON0_F_PER_M, HBAR_EV_S, HBAR2_OVER_2M0, HC_EV_NM, KB_EV_PER_K } from '../../../engine/constants.js';
import { findTransition, type SolveResult } from '../../../engine/solve.js';
import { opticalBands } from '../../../engine/optics/bands.js';
import { lineshape } from '../../../engine/optics/lineshape.js';
import { SpectrumEngine } from '../../../engine/optics/spectra.js';
import { expectClose } from '../../observables/close.js';
import { grid, solvedStack } from '../../optics/helpers.js';

const EP = 25;
const N_R = 3.6;
const WELL = [['Al0.3Ga0.7As', 20], ['GaAs', 8], ['Al0.3Ga0.7As', 20]] as const;
const parabolic = solvedStack(WELL, { solver: '{ valence: parabolic, nonparabolic: false }' });

/** e² m_r/(6 n_r ε0 c ħ² ω L_w) · M in cm⁻¹, per unit inversion, with M in eV and ħω in eV. */
function stepPerInversion(mr: number, M_eV: number, photon_eV: number, L_nm: number): number {
  const e = ELEMENTARY_CHARGE_C;
  const hbar = HBAR_EV_S * e;
  const c = HC_EV_NM * 1e-9 / (2 * Math.PI * HBAR_EV_S);
  const omega = photon_eV / HBAR_EV_S;
  return (e * e * mr * M_eV * e) / (6 * N_R * EPSILON0_F_PER_M * c * hbar * hbar * omega * L_nm * 1e-9) / 100;
}

interface PairForm { readonly label: string; readonly edge: number; readonly En: number; readonly Ej: number; readonly me: number; readonly mh: number; readonly te: number; readonly tm: number }

/** The subband pairs of a parabolic solve in closed form. */
function pairs(r: SolveResult): PairForm[] {
  const out: PairForm[] = [];
  for (const e of r.bands.electron.states) {
    for (const [band, f] of [['heavy_hole', { te: 1.5, tm: 0 }], ['light_hole', { te: 0.5, tm: 2 }]] as const) {
      for (const h of r.bands[band].states) {
        const o2 = findTransition(r, `${e.label}-${h.label}`)!.overlap2;
        out.push({ label: `${e.label}-${h.label}`, edge: e.energy_eV - h.energy_eV, En: e.energy_eV, Ej: h.energy_eV, me: e.mass_inplane, mh: h.mass_inplane, te: f.te * EP * o2, tm: f.tm * EP * o2 });
      }
    }
  }
  return out;
}

/** Fermi level of parabolic 2-D subbands (particle sense: energies rising) for a sheet density, by bisection. */
function fermiLevel(subbands: readonly { E: number; m: number }[], n_cm2: number, T: number): number {
  const kT = KB_EV_PER_K * T;
  // m kT/(πħ²) in cm⁻² = m kT / (2π ħ²/2m0) nm⁻² × 1e14.
  const density = (F: number): number => subbands.reduce((s, b) => s + (b.m * kT / (2 * Math.PI * HBAR2_OVER_2M0)) * 1e14 * Math.log1p(Math.exp((F - b.E) / kT)), 0);
  let lo = Math.min(...subbands.map((b) => b.E)) - 1;
  let hi = lo + 3;
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (density(mid) < n_cm2) lo = mid; else hi = mid;
  }
  return 0.5 * (lo + hi);
}

const fermi = (x: number): number => 1 / (1 + Math.exp(x));

/** Closed-form gain (cm⁻¹) at ħω for quasi-Fermi levels Fc, Fv (absolute, eV). */
function closedForm(ps: readonly PairForm[], photon: number, Fc: number, Fv: number, T: number, which: 'te' | 'tm', L: number): number {
  const kT = KB_EV_PER_K * T;
  let g = 0;
  for (const p of ps) {
    if (photon <= p.edge) continue;
    const mr = 1 / (1 / p.me + 1 / p.mh);
    const u = (photon - p.edge) * mr / HBAR2_OVER_2M0;
    const Ec = p.En + HBAR2_OVER_2M0 * u / p.me;
    const Ev = p.Ej - HBAR2_OVER_2M0 * u / p.mh;
    const inversion = Number.isFinite(Fc) ? fermi((Ec - Fc) / kT) - fermi((Ev - Fv) / kT) : -1;
    g += stepPerInversion(mr, p[which], photon, L) * inversion;
  }
  return g;
}

describe('parabolic bands, no broadening: the joint-DOS staircase times the inversion factor', () => {
  const bands = opticalBands(parabolic, { model: 'parabolic', kaneEnergy_eV: EP })!;
  const ps = pairs(parabolic);
  const edges = ps.map((p) => p.edge).sort((a, b) => a - b);
  const photons = grid(bands.edge_eV - 0.02, bands.edge_eV + 0.2, 221);
  const engine = new SpectrumEngine(bands, { photon_eV: photons, lineshape: lineshape('delta', 1), refractiveIndex: N_R, occupationStep_eV: 2e-4 });
  const bin = Math.min(...Array.from(engine.edges).slice(1).map((e, i) => e - engine.edges[i]!));
  // Photon energies whose bin holds no step edge (the spectrum there is a bin average of a step).
  const clear = Array.from(photons).filter((w) => edges.every((e) => Math.abs(w - e) > 3 * bin));

  it('at zero density the absorption is a staircase whose steps match the joint-DOS closed form to 1e-6', () => {
    const empty = engine.at({ electrons_cm2: 0, holes_cm2: 0 });
    for (const which of ['te', 'tm'] as const) {
      const g = which === 'te' ? empty.gain_te_per_cm : empty.gain_tm_per_cm;
      photons.forEach((w, j) => {
        if (!clear.includes(w)) return;
        expectClose(g[j]!, closedForm(ps, w, -Infinity, Infinity, 300, which, 8), { rel: 1e-6, abs: 1e-9 }, `${which} absorption at ${w.toFixed(4)} eV`);
      });
    }
    // Each step height times ħω on its own: the plateau just above an edge minus the one just below.
    const above = (e: number): number => photons.find((w) => w > e + 3 * bin && clear.includes(w))!;
    const below = (e: number): number => [...photons].reverse().find((w) => w < e - 3 * bin && clear.includes(w))!;
    const heights: string[] = [];
    for (const p of ps.filter((q) => q.te > 1e-3 * EP && q.edge + 0.01 < photons[photons.length - 1]! && q.edge > photons[0]! + 0.005)) {
      const a = above(p.edge);
      const b = below(p.edge);
      const at = (w: number): number => -empty.gain_te_per_cm[photons.indexOf(w)]! * w;
      // Other pairs whose edges lie between b and a would add their own steps: skip those.
      if (ps.some((q) => q !== p && q.edge > b && q.edge < a && q.te > 0)) continue;
      const expected = stepPerInversion(1 / (1 / p.me + 1 / p.mh), p.te, 1, 8);
      expectClose(at(a) - at(b), expected, { rel: 1e-6 }, `${p.label} TE step × ħω`);
      heights.push(`${p.label} ${(at(a) - at(b)).toFixed(2)} (closed form ${expected.toFixed(2)})`);
    }
    expect(heights.length).toBeGreaterThanOrEqual(2);
    console.log(`step heights × ħω (cm⁻¹ eV): ${heights.join('; ')}`);
  });

  it('at 1, 3 and 6 × 10¹² cm⁻² the gain is that staircase times f_c − f_v, with Fermi levels from the closed-form 2-D densities (1e-5 of the absorption)', () => {
    const T = 300;
    for (const n of [1e12, 3e12, 6e12]) {
      const Fc = fermiLevel(parabolic.bands.electron.states.map((s) => ({ E: s.energy_eV, m: s.mass_inplane })), n, T);
      const Fv = -fermiLevel([...parabolic.bands.heavy_hole.states, ...parabolic.bands.light_hole.states].map((s) => ({ E: -s.energy_eV, m: s.mass_inplane })), n, T);
      const s = engine.at({ electrons_cm2: n, holes_cm2: n });
      expectClose(s.levels.electron_eV, Fc, { abs: 1e-9 }, `electron quasi-Fermi level at ${n}`);
      expectClose(s.levels.hole_eV, Fv, { abs: 1e-9 }, `hole quasi-Fermi level at ${n}`);
      let worst = 0;
      photons.forEach((w, j) => {
        if (!clear.includes(w)) return;
        for (const which of ['te', 'tm'] as const) {
          const got = (which === 'te' ? s.gain_te_per_cm : s.gain_tm_per_cm)[j]!;
          const want = closedForm(ps, w, Fc, Fv, T, which, 8);
          const scale = Math.abs(closedForm(ps, w, -Infinity, Infinity, T, which, 8));
          expectClose(got, want, { abs: 1e-5 * scale + 1e-9 }, `${which} gain at ${w.toFixed(4)} eV, n = ${n}`);
          worst = Math.max(worst, Math.abs(got - want) / (scale || 1));
        }
      });
      console.log(`n = ${n.toExponential(0)}: Fc ${Fc.toFixed(5)} eV, Fv ${Fv.toFixed(5)} eV, worst |g − closed form| / |α| = ${worst.toExponential(2)}`);
    }
  });

  it('the gain tends to minus the unpumped absorption at vanishing density and to plus it at full inversion', () => {
    const empty = engine.at({ electrons_cm2: 0, holes_cm2: 0 });
    const tiny = engine.at({ electrons_cm2: 1e3, holes_cm2: 1e3 });
    // Full inversion of the band edge: a cold, dense plasma fills the lowest pairs' states.
    const cold = solvedStack(WELL, { T: 20, solver: '{ valence: parabolic, nonparabolic: false }' });
    const coldBands = opticalBands(cold, { model: 'parabolic', kaneEnergy_eV: EP })!;
    const coldEngine = new SpectrumEngine(coldBands, { photon_eV: photons, lineshape: lineshape('delta', 1), refractiveIndex: N_R });
    const coldEmpty = coldEngine.at({ electrons_cm2: 0, holes_cm2: 0 });
    const full = coldEngine.at({ electrons_cm2: 5e12, holes_cm2: 5e12 });
    const first = ps.reduce((a, b) => (b.edge < a.edge ? b : a)).edge;
    let worstTiny = 0;
    let worstFull = 0;
    photons.forEach((w, j) => {
      if (!clear.includes(w)) return;
      const a = -empty.gain_te_per_cm[j]!;
      if (a > 0) {
        expectClose(tiny.gain_te_per_cm[j]!, -a, { rel: 1e-6 }, `gain at 1e3 cm⁻² vs −α at ${w.toFixed(4)} eV`);
        worstTiny = Math.max(worstTiny, Math.abs(tiny.gain_te_per_cm[j]! + a) / a);
      }
      const ca = -coldEmpty.gain_te_per_cm[j]!;
      if (ca > 0 && w < first + 0.008) {
        expectClose(full.gain_te_per_cm[j]!, ca, { rel: 1e-3 }, `gain at full inversion vs +α at ${w.toFixed(4)} eV`);
        worstFull = Math.max(worstFull, Math.abs(full.gain_te_per_cm[j]! - ca) / ca);
      }
    });
    console.log(`|g(1e3 cm⁻²) + α|/α ≤ ${worstTiny.toExponential(2)}; |g(5e12 cm⁻², 20 K) − α|/α ≤ ${worstFull.toExponential(2)} within 8 meV of the edge`);
    expect(worstFull).toBeGreaterThanOrEqual(0);
  });
});

describe('polarisation factors at the subband edges (k·p states at k∥ = 0)', () => {
  /** TE and TM of e1 with a hole subband, per state of the Kramers pair, over Ep·(single-band overlap²). */
  const factorsOf = (model: 'kp4' | 'kp6', hole: string): { te: number; tm: number } => {
    const r = solvedStack(WELL, { solver: `{ valence: ${model} }` });
    const bands = opticalBands(r, { model, kaneEnergy_eV: EP, kPoints: 3, kMax_per_nm: 0.1 })!;
    const j = bands.holeLabels.indexOf(hole);
    const ps = bands.directions[0]!.pairs.filter((p) => p.electron === 0 && p.hole === j);
    const o2 = findTransition(r, `e1-${hole}`)!.overlap2;
    return { te: ps.reduce((s, p) => s + p.te[0]!, 0) / (2 * EP * o2), tm: ps.reduce((s, p) => s + p.tm[0]!, 0) / (2 * EP * o2) };
  };

  it('kp4: TE/TM = 3/2, 0 for e1-hh1 and 1/2, 2 for e1-lh1', () => {
    const hh = factorsOf('kp4', 'hh1');
    const lh = factorsOf('kp4', 'lh1');
    console.log(`kp4: e1-hh1 TE ${hh.te.toFixed(5)} TM ${hh.tm.toExponential(2)}; e1-lh1 TE ${lh.te.toFixed(5)} TM ${lh.tm.toFixed(5)}`);
    // 2e-3: the k·p overlap is a box-rule sum on the 0.2 nm valence grid, the reference a Simpson sum on 0.05 nm.
    expectClose(hh.te, 1.5, { rel: 2e-3 }, 'kp4 hh1 TE');
    expectClose(hh.tm, 0, { abs: 1e-9 }, 'kp4 hh1 TM');
    expectClose(lh.te, 0.5, { rel: 2e-3 }, 'kp4 lh1 TE');
    expectClose(lh.tm, 2, { rel: 2e-3 }, 'kp4 lh1 TM');
  });

  it('kp6: hh1 keeps 3/2, 0; lh1, mixed with the split-off band by the well, moves towards so (1, 1) with (2 TE + TM)/3 = 1 conserved', () => {
    const hh = factorsOf('kp6', 'hh1');
    const lh = factorsOf('kp6', 'lh1');
    console.log(`kp6: e1-hh1 TE ${hh.te.toFixed(5)} TM ${hh.tm.toExponential(2)}; e1-lh1 TE ${lh.te.toFixed(5)} TM ${lh.tm.toFixed(5)}, (2TE + TM)/3 = ${((2 * lh.te + lh.tm) / 3).toFixed(5)}`);
    expectClose(hh.te, 1.5, { rel: 2e-3 }, 'kp6 hh1 TE');
    expectClose(hh.tm, 0, { abs: 1e-9 }, 'kp6 hh1 TM');
    // The orbital-⊗-spin basis is unitary, so the polarisation average is the state's total overlap² (×Ep).
    expectClose((2 * lh.te + lh.tm) / 3, 1, { rel: 5e-3 }, 'kp6 lh1 polarisation average');
    expect(lh.te).toBeGreaterThan(0.5);
    expect(lh.tm).toBeLessThan(2);
  });
});
