/**
 * Intersubband matrix elements of a wire band on the grid its states were solved on: the dipoles
 * ⟨i|x|j⟩ and ⟨i|y|j⟩ across the wire (x in the growth plane, y along [001]) and each state's
 * sum-rule masses along x and y, from which engine/observables/matrix-elements.ts
 * oscillatorStrength gives the oscillator strength of either polarisation. Lengths nm, energies
 * eV, masses m0.
 */
import { failBadValue as fail } from '../errors.js';
import { HBAR2_OVER_2M0 } from '../constants.js';
import { massesAt } from '../solver2d/operator.js';
import type { CrossSectionGrid } from '../solver2d.js';

export interface WireMatrixElements {
  readonly count: number;
  /** ⟨i|x|j⟩ and ⟨i|y|j⟩ (nm, signed; origin the grid's centre, which drops out for i ≠ j), 0-based in the order given. */
  dipole(i: number, j: number): { readonly x: number; readonly y: number };
  /** Sum-rule masses of state i along x and y, 1/⟨i|1/m(E_i)|i⟩ (m0): the mass of oscillatorStrength for that polarisation. */
  mass(i: number): { readonly x: number; readonly y: number };
}

/**
 * Dipoles and sum-rule masses of states of one band on one cross-section grid.
 *
 * Inner product (our derivation, the grid form of intersubbandStates in
 * engine/observables/matrix-elements.ts): the 5-point operator is H(E) = Σ_faces w_f(E) d_f d_fᵀ + V,
 * d_f the difference across face f (the node itself at a wall), w_f = 2c/(m_a(E) + m_b(E))
 * (wall: (h/δ)c/m_a(E)), c = (ħ²/2m0)/h². Subtracting ψ_jᵀH(E_i)ψ_i − ψ_iᵀH(E_j)ψ_j gives
 * (E_i − E_j)⟨i|j⟩ = 0 with
 *   ⟨i|j⟩ = Σ_k ψ_i,k ψ_j,k + Σ_f W_f (d_fψ_i)(d_fψ_j),  W_f = −(w_f(E_i) − w_f(E_j))/(E_i − E_j),
 * for the two-band mass m(E) = m(1 + α(E − V)) (linear in E) W_f = 2c(m_aα_a + m_bα_b)/(S_f(E_i)S_f(E_j)),
 * S_f = m_a(E) + m_b(E) (wall: (h/δ)c·m_aα_a/(m_a(E_i)m_a(E_j))): the grid's valence-like
 * component, as ħ²αm p_i p_j/2m0 is in the continuum (Kane two-band model; C. Sirtori, F. Capasso,
 * J. Faist, S. Scandolo, Phys. Rev. B 50, 8663 (1994), from memory). The same subtraction with the
 * diagonal X inserted gives the position in that product,
 *   x_ij = [Σ_k ψ_i,k x_k ψ_j,k + Σ_f W_f x_f (d_fψ_i)(d_fψ_j)] / √(⟨i|i⟩⟨j|j⟩),
 * x_f the face's midpoint (a wall face and a y-face: the node's x), whose velocity form
 * (E_j − E_i)x_ij = −h Σ_{x-faces}[w_f(E_j) ψ̄_i d_fψ_j − w_f(E_i) ψ̄_j d_fψ_i] is origin-free; likewise
 * y_ij. The states are orthogonal in this product when W is taken at their energies on the grid;
 * the extrapolated subband edges differ from those by the discretisation error, which moves W
 * (through m(E)) by a relative α·ΔE, far below the dipoles' own O(h²) error. For a parabolic
 * band W = 0: x_ij = Σ ψ_i x ψ_j dx dy, and the grid's Thomas–Reiche–Kuhn sum over all its states
 * is exact,
 * Σ_j (E_j − E_i) x_ij² = (ħ²/2m0) Σ_{x-faces} (2/(m_a + m_b)) u_a u_b (u = ψ√(dx dy)), within O(h²)
 * of (ħ²/2m0)⟨i|1/m_x|i⟩.
 *
 * Masses: 1/⟨i|1/m_x(E_i)|i⟩ and 1/⟨i|1/m_y(E_i)|i⟩ with the grid's cell-averaged masses (plain
 * |ψ|² weights, normalised), the mass that makes the sum rule exact for a parabolic band
 * (sumRuleMass of the well code), so that with oscillatorStrength Σ_j f_ij = 1 per polarisation;
 * a non-parabolic band sums to less over its conduction states, as in wells.
 *
 * @param grid the grid the states were solved on (nm, eV, m0).
 * @param energies_eV each state's energy (eV), for the masses m(E) of a non-parabolic grid.
 * @param psi the states on the grid's nodes, index i + nx·j (any normalisation).
 */
export function wireMatrixElements(grid: CrossSectionGrid, energies_eV: readonly number[], psi: readonly Float64Array[]): WireMatrixElements {
  const { nx, ny } = grid;
  const n = nx * ny;
  if (energies_eV.length !== psi.length) fail('wireMatrixElements.energies_eV', `needs one energy per state (${psi.length})`, `${energies_eV.length} energies`, 'pass the states\' energies in their order');
  psi.forEach((v, k) => {
    if (v.length !== n) fail(`wireMatrixElements.psi[${k}]`, `must hold nx·ny = ${n} values`, `${v.length} values`, 'pass states of this grid, index i + nx·j');
  });
  const masses = energies_eV.map((e) => massesAt(grid, e));
  const cx = HBAR2_OVER_2M0 / (grid.dx_nm * grid.dx_nm);
  const cy = HBAR2_OVER_2M0 / (grid.dy_nm * grid.dy_nm);
  const wx = grid.wall_nm ? grid.dx_nm / grid.wall_nm[0] : 1;
  const wy = grid.wall_nm ? grid.dy_nm / grid.wall_nm[1] : 1;
  const edgeX = grid.mass;
  const edgeY = grid.massY ?? grid.mass;
  const alpha = grid.alpha;
  // Coordinates from the grid's centre: i − (nx − 1)/2 spacings.
  const xc = (i: number): number => (i - (nx - 1) / 2) * grid.dx_nm;
  const yc = (j: number): number => (j - (ny - 1) / 2) * grid.dy_nm;

  /** Σ_k u_a u_b (1, x or y) plus the faces' W-weighted terms of states a and b. */
  const product = (a: number, b: number): { readonly one: number; readonly x: number; readonly y: number } => {
    const ua = psi[a]!;
    const ub = psi[b]!;
    let one = 0;
    let px = 0;
    let py = 0;
    for (let j = 0; j < ny; j++) {
      for (let i = 0; i < nx; i++) {
        const k = i + nx * j;
        const p = ua[k]! * ub[k]!;
        one += p;
        px += xc(i) * p;
        py += yc(j) * p;
      }
    }
    if (alpha === undefined) return { one, x: px, y: py };
    const ma = masses[a]!;
    const mb = masses[b]!;
    // One face: weight W, position (fx, fy), differences da and db of the two states.
    const face = (w: number, fx: number, fy: number, da: number, db: number): void => {
      const t = w * da * db;
      one += t;
      px += fx * t;
      py += fy * t;
    };
    for (let j = 0; j < ny; j++) {
      for (let i = 0; i < nx; i++) {
        const k = i + nx * j;
        const dx = edgeX[k]! * alpha[k]!;
        const dy = edgeY[k]! * alpha[k]!;
        if (i === 0) face((wx * cx * dx) / (ma.x[k]! * mb.x[k]!), xc(i), yc(j), ua[k]!, ub[k]!);
        if (i === nx - 1) face((wx * cx * dx) / (ma.x[k]! * mb.x[k]!), xc(i), yc(j), ua[k]!, ub[k]!);
        else face((2 * cx * (dx + edgeX[k + 1]! * alpha[k + 1]!)) / ((ma.x[k]! + ma.x[k + 1]!) * (mb.x[k]! + mb.x[k + 1]!)), xc(i + 0.5), yc(j), ua[k]! - ua[k + 1]!, ub[k]! - ub[k + 1]!);
        if (j === 0) face((wy * cy * dy) / (ma.y[k]! * mb.y[k]!), xc(i), yc(j), ua[k]!, ub[k]!);
        if (j === ny - 1) face((wy * cy * dy) / (ma.y[k]! * mb.y[k]!), xc(i), yc(j), ua[k]!, ub[k]!);
        else face((2 * cy * (dy + edgeY[k + nx]! * alpha[k + nx]!)) / ((ma.y[k]! + ma.y[k + nx]!) * (mb.y[k]! + mb.y[k + nx]!)), xc(i), yc(j + 0.5), ua[k]! - ua[k + nx]!, ub[k]! - ub[k + nx]!);
      }
    }
    return { one, x: px, y: py };
  };
  const norms = psi.map((_, k) => product(k, k).one);
  const index = (i: number, what: string): number => {
    if (!Number.isInteger(i) || i < 0 || i >= psi.length) fail(`wireMatrixElements.${what}`, `must be a state index from 0 to ${psi.length - 1}`, i, 'pass the 0-based index of a state given');
    return i;
  };
  return {
    count: psi.length,
    dipole(i, j) {
      const p = product(index(i, 'dipole'), index(j, 'dipole'));
      const s = Math.sqrt(norms[i]! * norms[j]!);
      return { x: p.x / s, y: p.y / s };
    },
    mass(i) {
      const u = psi[index(i, 'mass')]!;
      const m = masses[i]!;
      let w = 0;
      let ix = 0;
      let iy = 0;
      for (let k = 0; k < n; k++) {
        const p = u[k]! * u[k]!;
        w += p;
        ix += p / m.x[k]!;
        iy += p / m.y[k]!;
      }
      return { x: w / ix, y: w / iy };
    },
  };
}
