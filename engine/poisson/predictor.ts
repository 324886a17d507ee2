/**
 * The predictor step of the self-consistent loop: the Poisson equation solved with the carriers'
 * charge answering a change of the potential where it happens, so the loop's map no longer
 * overshoots (the charge sloshing of wide or coupled wells, where plain mixing needs hundreds of
 * steps or none converge).
 *
 * Method (A. Trellakis, A. T. Galick, A. Pacelli, U. Ravaioli, J. Appl. Phys. 81, 7880 (1997)): with
 * the subbands E_i, ψ_i of the input potential U_in, a trial U moves every level locally by
 * δ(z) = U(z) − U_in(z) (−δ in the holes' particle sense), so the carriers at node k are
 *   L_k(U, F) = Σ_i w_ik Σ_c s_ic n_i(F_c − σδ_k) + Σ_gas weight · n_gas(F_c − σδ_k),
 * w_ik the state's nodal charge weights, s_ic its share in cell c, σ = +1 for electrons and −1 for
 * holes; the finite-element Poisson rows (poisson.ts) with this charge and the neutrality of each
 * cell are solved together for U and the cells' Fermi levels by Newton's method (the Jacobian is the
 * tridiagonal stiffness plus a diagonal, bordered by one column and one row per cell: Schur
 * complement, Thomas algorithm), steps capped at 0.1 eV. At the self-consistent point δ = 0 and the
 * predicted charge is the charge of the states: a fixed point of this map is the solution.
 * Units: eV, nm, densities nm⁻² (loads).
 */
import { gasDensity, gasSlope, subbandFilling, subbandSlope, type GasSite } from './occupation.js';
import { solveDense } from './mixing.js';
import { E_OVER_EPS0_V_NM, type PoissonMesh } from './poisson.js';
import type { MeshState } from './subbands.js';

/** A gas point of the loop: its node, cell, trapezoid weight (nm) and site. */
export interface GasPoint { readonly node: number; readonly cell: number; readonly weight: number; readonly site: GasSite }

export interface PredictorInput {
  readonly mesh: PoissonMesh;
  /** The potential the states were solved in (eV at the nodes). */
  readonly potential: Float64Array;
  /** Net ionised dopant loads (nm⁻², donors positive). */
  readonly dopants: Float64Array;
  /** +1 electrons, −1 holes. */
  readonly sign: 1 | -1;
  readonly states: readonly MeshState[];
  /** share[i][c]: the part of state i in cell c. */
  readonly share: readonly (readonly number[])[];
  readonly gas: readonly GasPoint[];
  /** Cells whose carriers are counted (net majority doping), and each one's wanted carriers (nm⁻²). */
  readonly wanted: readonly number[];
  readonly kT: number;
  /** Fermi levels (particle sense) neutral in the input potential: Newton's start. */
  readonly fermi: readonly number[];
}

/** Largest change of U or of a Fermi level in one Newton step (eV). */
const MAX_STEP_EV = 0.1;
/** Newton stops when no node moves by more than this (eV). */
const NEWTON_TOLERANCE_EV = 1e-12;
const MAX_NEWTON = 60;

/** Thomas algorithm for a tridiagonal system (sub, diag, sup of equal length; sub[0], sup[n−1] unused), one right-hand side. */
function thomas(sub: Float64Array, diag: Float64Array, sup: Float64Array, rhs: Float64Array): Float64Array {
  const n = diag.length;
  const c = new Float64Array(n);
  const d = new Float64Array(n);
  c[0] = sup[0]! / diag[0]!;
  d[0] = rhs[0]! / diag[0]!;
  for (let i = 1; i < n; i++) {
    const m = diag[i]! - sub[i]! * c[i - 1]!;
    c[i] = sup[i]! / m;
    d[i] = (rhs[i]! - sub[i]! * d[i - 1]!) / m;
  }
  for (let i = n - 2; i >= 0; i--) d[i] = d[i]! - c[i]! * d[i + 1]!;
  return d;
}

/**
 * The predicted potential (eV at the nodes; U_0 = 0) and Fermi levels (particle sense) of one
 * loop pass (see the module comment), and the Newton steps taken.
 */
export function predictPotential(input: PredictorInput): { readonly potential: Float64Array; readonly fermi: number[]; readonly steps: number } {
  const { mesh, potential: Uin, dopants, sign, states, share, gas, wanted, kT } = input;
  const z = mesh.z;
  const N = z.length - 1;
  const C = wanted.length;
  const K = E_OVER_EPS0_V_NM;
  const active = wanted.map((w) => w > 0);
  const U = Float64Array.from(Uin);
  const F = Array.from(input.fermi);
  const flux = new Float64Array(N);
  for (let e = 0; e < N; e++) flux[e] = mesh.eps[e]! / (z[e + 1]! - z[e]!);
  let steps = 0;
  for (; steps < MAX_NEWTON; steps++) {
    // Carriers, their U-derivative per node and F-derivative per node and cell; cell totals.
    const L = new Float64Array(N + 1);
    const dLdU = new Float64Array(N + 1);
    const dLdF = Array.from({ length: C }, () => new Float64Array(N + 1));
    const carried = new Float64Array(C);
    for (let i = 0; i < states.length; i++) {
      const s = states[i]!;
      for (let c = 0; c < C; c++) {
        const part = share[i]![c]!;
        if (!(part > 0) || !active[c]) continue;
        for (let k = 0; k <= N; k++) {
          const w = s.weights[k]! * part;
          if (w === 0) continue;
          const x = F[c]! - sign * (U[k]! - Uin[k]!);
          const n = w * subbandFilling(s.mass, s.energy, x, kT);
          const dn = w * subbandSlope(s.mass, s.energy, x, kT);
          L[k] += n;
          carried[c] += n;
          dLdU[k] -= sign * dn;
          dLdF[c]![k] += dn;
        }
      }
    }
    for (const g of gas) {
      if (!active[g.cell]) continue;
      const x = F[g.cell]! - sign * (U[g.node]! - Uin[g.node]!);
      const n = g.weight * gasDensity(g.site, x, kT);
      const dn = g.weight * gasSlope(g.site, x, kT);
      L[g.node] += n;
      carried[g.cell] += n;
      dLdU[g.node] -= sign * dn;
      dLdF[g.cell]![g.node] += dn;
    }
    // Poisson rows k = 1..N (U_0 = 0 fixed): flux balance − K (dopants − σ L).
    const R = new Float64Array(N);
    const sub = new Float64Array(N);
    const diag = new Float64Array(N);
    const sup = new Float64Array(N);
    for (let k = 1; k <= N; k++) {
      const right = k < N ? flux[k]! * (U[k + 1]! - U[k]!) : 0;
      const left = flux[k - 1]! * (U[k]! - U[k - 1]!);
      R[k - 1] = right - left - K * (dopants[k]! - sign * L[k]!);
      diag[k - 1] = -(k < N ? flux[k]! : 0) - flux[k - 1]! + K * sign * dLdU[k]!;
      if (k < N) sup[k - 1] = flux[k]!;
      if (k > 1) sub[k - 1] = flux[k - 1]!;
    }
    const minusR = R.map((x) => -x);
    const y = thomas(sub, diag, sup, minusR);
    const cells = [...Array(C).keys()].filter((c) => active[c]);
    const Y = cells.map((c) => thomas(sub, diag, sup, dLdF[c]!.subarray(1).map((d) => K * sign * d)));
    // Neutrality rows: carried_c − wanted_c, with ∂/∂U_k = σ-signed dLdF and ∂/∂F_c = Σ_k dLdF.
    const S = cells.map(() => new Float64Array(cells.length));
    const rhs = new Float64Array(cells.length);
    cells.forEach((c, a) => {
      const row = dLdF[c]!;
      let dF = 0;
      for (let k = 0; k <= N; k++) dF += row[k]!;
      let cy = 0;
      for (let k = 1; k <= N; k++) cy += -sign * row[k]! * y[k - 1]!;
      rhs[a] = -(carried[c]! - wanted[c]!) - cy;
      cells.forEach((_, b) => {
        let cY = 0;
        const Yb = Y[b]!;
        for (let k = 1; k <= N; k++) cY += -sign * row[k]! * Yb[k - 1]!;
        S[a]![b] = (a === b ? dF : 0) - cY;
      });
    });
    const dFermi = cells.length > 0 ? solveDense(S, rhs) : new Float64Array(0);
    const dU = new Float64Array(N);
    for (let k = 0; k < N; k++) {
      let v = y[k]!;
      cells.forEach((_, b) => { v -= Y[b]![k]! * dFermi[b]!; });
      dU[k] = v;
    }
    let largest = 0;
    for (let k = 0; k < N; k++) largest = Math.max(largest, Math.abs(dU[k]!));
    for (let a = 0; a < cells.length; a++) largest = Math.max(largest, Math.abs(dFermi[a]!));
    const scale = largest > MAX_STEP_EV ? MAX_STEP_EV / largest : 1;
    for (let k = 0; k < N; k++) U[k + 1] = U[k + 1]! + scale * dU[k]!;
    cells.forEach((c, a) => { F[c] = F[c]! + scale * dFermi[a]!; });
    if (largest * scale < NEWTON_TOLERANCE_EV) break;
  }
  return { potential: U, fermi: F, steps };
}
