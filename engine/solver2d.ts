/**
 * Cross-section solver for quantum wires: the lowest subband edges and envelopes of the
 * single-band BenDaniel–Duke equation in the wire's cross-section (x, y), with free motion along
 * the wire and a diagonal mass tensor M = diag(m_x, m_y),
 *
 *   −(ħ²/2m0) [∂x (1/m_x ∂x ψ) + ∂y (1/m_y ∂y ψ)] + V(x, y) ψ = E ψ,   ħ²/2m0 = HBAR2_OVER_2M0 eV nm², m in m0,
 *
 * (D. J. BenDaniel and C. B. Duke, Phys. Rev. 152, 683 (1966)), the masses optionally of the
 * two-band non-parabolic form m(E) = m·(1 + α(E − V)), discretised by 5-point finite differences
 * (engine/solver2d/operator.ts) and solved by LOBPCG (engine/solver2d/lobpcg.ts) preconditioned by
 * a geometric multigrid V-cycle (engine/solver2d/multigrid.ts). Memory and work per iteration grow
 * linearly with the number of nodes.
 */
import { InputError } from './errors.js';
import { symmetricEigen } from './solver2d/dense.js';
import { lobpcg } from './solver2d/lobpcg.js';
import { buildMultigrid, type MultigridPreconditioner } from './solver2d/multigrid.js';
import { applyStencil, buildOperator, energyForm } from './solver2d/operator.js';
import type { CrossSectionGrid, WireStates } from './solver2d/types.js';

export type { CrossSectionGrid, WireStates } from './solver2d/types.js';
export { symmetricEigen, type SymmetricEigen } from './solver2d/dense.js';

/** Settings of {@link solveCrossSection}. */
export interface CrossSectionOptions {
  /** Stop when every wanted state has ‖Hψ − Eψ‖ ≤ tolerance_eV for ψ of unit Euclidean norm on the nodes (eV). Default 1e-6, which bounds the energy error by about ‖r‖²/gap ≈ 1e-10 eV for a 10 meV gap. */
  readonly tolerance_eV?: number;
  /** Iteration cap of the eigen-solver; reaching it gives status 'max-iterations'. Default 400. */
  readonly maxIterations?: number;
  /**
   * Non-parabolic grids: energy (eV) at which the masses of the first solve are taken, e.g. the
   * ground state found on a coarser grid; default the band-edge masses. Only the work depends on it.
   */
  readonly startEnergy_eV?: number;
}

/** Grids with at most this many nodes are solved densely (Jacobi on the full matrix). */
const DENSE_LIMIT = 64;

const positive = (value: number, where: string, hint: string): void => {
  if (!(Number.isFinite(value) && value > 0)) {
    throw new InputError('bad-value', `${where}: must be a finite positive number, got ${value}; ${hint}`, where);
  }
};

function validate(grid: CrossSectionGrid, count: number): void {
  for (const key of ['nx', 'ny'] as const) {
    const v = grid[key];
    if (!Number.isInteger(v) || v < 1) {
      throw new InputError('bad-value', `grid.${key}: must be a positive integer, got ${v}; give the number of interior nodes`, `grid.${key}`);
    }
  }
  positive(grid.dx_nm, 'grid.dx_nm', 'give the node spacing in nm');
  positive(grid.dy_nm, 'grid.dy_nm', 'give the node spacing in nm');
  if (!Number.isFinite(grid.x0_nm) || !Number.isFinite(grid.y0_nm)) {
    throw new InputError('bad-value', `grid.x0_nm/y0_nm: must be finite, got (${grid.x0_nm}, ${grid.y0_nm}); give the coordinates of node (0, 0) in nm`, 'grid.x0_nm');
  }
  const n = grid.nx * grid.ny;
  const arrays = [['V', grid.V], ['mass', grid.mass], ['massY', grid.massY], ['alpha', grid.alpha]] as const;
  for (const [key, values] of arrays) {
    if (values !== undefined && values.length !== n) {
      throw new InputError('bad-value', `grid.${key}: must hold nx·ny = ${n} values, got ${values.length}; index nodes as i + nx·j`, `grid.${key}`);
    }
  }
  let vmin = Infinity;
  let vmax = -Infinity;
  for (let k = 0; k < n; k++) {
    if (!Number.isFinite(grid.V[k])) {
      throw new InputError('bad-value', `grid.V[${k}]: must be finite, got ${grid.V[k]}; give the potential in eV`, 'grid.V');
    }
    vmin = Math.min(vmin, grid.V[k]);
    vmax = Math.max(vmax, grid.V[k]);
    for (const key of ['mass', 'massY'] as const) {
      const m = grid[key]?.[k];
      if (m !== undefined && !(m > 0 && Number.isFinite(m))) {
        throw new InputError('bad-value', `grid.${key}[${k}]: must be a finite positive mass, got ${m}; give the effective mass in m0`, `grid.${key}`);
      }
    }
  }
  if (grid.alpha !== undefined) {
    // As in engine/solver1d.ts: the two-band mass must stay positive for every energy a state of the grid can have, [min V, max V].
    for (let k = 0; k < n; k++) {
      const a = grid.alpha[k];
      if (!(Number.isFinite(a) && Math.min(1 + a * (vmin - grid.V[k]), 1 + a * (vmax - grid.V[k])) > 0)) {
        throw new InputError('bad-value', `grid.alpha[${k}]: must keep the mass m(E) = m·(1 + α(E − V)) positive between ${vmin} and ${vmax} eV, got ${a}; reduce |α| or the band offsets`, 'grid.alpha');
      }
    }
  }
  if (!Number.isInteger(count) || count < 1 || count > n) {
    throw new InputError('bad-value', `count: must be an integer from 1 to the node count ${n}, got ${count}; ask for fewer states or refine the grid`, 'count');
  }
}

/** Deterministic uniform numbers in [0, 1) (mulberry32, a public-domain 32-bit generator). */
function seeded(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Mode numbers (p, q) of the lowest Dirichlet-box modes
 * sin(pπ(i+1)/(nx+1)) sin(qπ(j+1)/(ny+1)), ordered by p²/Lx² + q²/Ly².
 */
function boxModes(grid: CrossSectionGrid, size: number): [number, number][] {
  const { nx, ny } = grid;
  const lx = (nx + 1) * grid.dx_nm;
  const ly = (ny + 1) * grid.dy_nm;
  const modes: [number, number][] = [];
  for (let q = 1; q <= Math.min(ny, size); q++) for (let p = 1; p <= Math.min(nx, size); p++) modes.push([p, q]);
  modes.sort((a, b) => a[0] ** 2 / lx ** 2 + a[1] ** 2 / ly ** 2 - (b[0] ** 2 / lx ** 2 + b[1] ** 2 / ly ** 2));
  return modes.slice(0, size);
}

/** sin(mode·π(i+1)/(count+1)) for i = 0 … count − 1. */
const sines = (count: number, mode: number): Float64Array =>
  Float64Array.from({ length: count }, (_, i) => Math.sin((mode * Math.PI * (i + 1)) / (count + 1)));

/**
 * Deterministic start block: the lowest box modes, each perturbed by 1 % of a fixed-seed mixture
 * of the lowest 2·size box modes so that every wanted state is represented whatever the symmetry of the
 * cross-section. (Starting from interpolated coarse-grid states was tried and needed more fine
 * iterations: bilinear interpolation leaves an O(1) residual.) Smooth modes rather than white
 * noise, which would put a large residual into every vector. Every mode is a product of 1-D
 * sines, so each vector is summed as Σ_q u_q(x) sin_q(y), one pass over the grid per distinct q.
 */
function startBlock(grid: CrossSectionGrid, size: number): Float64Array[] {
  const { nx, ny } = grid;
  const extra = boxModes(grid, 2 * size);
  // Tables indexed by mode number (entry 0 unused).
  const sx = Array.from({ length: 1 + Math.max(...extra.map((m) => m[0])) }, (_, p) => sines(nx, p));
  const sy = Array.from({ length: 1 + Math.max(...extra.map((m) => m[1])) }, (_, q) => sines(ny, q));
  const peak = (v: Float64Array): number => v.reduce((m, x) => Math.max(m, Math.abs(x)), 0);
  const random = seeded(20010517);
  return extra.slice(0, size).map(([p, q]) => {
    const big = peak(sx[p]) * peak(sy[q]);
    const weights = [1, ...extra.map(() => 0.01 * big * (2 * random() - 1))];
    const rows = new Map<number, Float64Array>();
    [[p, q] as [number, number], ...extra].forEach(([a, b], e) => {
      const u = rows.get(b) ?? new Float64Array(nx);
      const x = sx[a];
      for (let i = 0; i < nx; i++) u[i] += weights[e] * x[i];
      rows.set(b, u);
    });
    const v = new Float64Array(nx * ny);
    for (const [b, u] of rows) {
      const y = sy[b];
      for (let j = 0; j < ny; j++) {
        const t = y[j];
        const row = nx * j;
        for (let i = 0; i < nx; i++) v[row + i] += u[i] * t;
      }
    }
    return v;
  });
}

/** Scales a unit Euclidean vector to Σψ² dx dy = 1 with its largest-magnitude entry positive. */
function normalise(v: Float64Array, dxdy: number): Float64Array {
  let big = 0;
  for (let k = 0; k < v.length; k++) if (Math.abs(v[k]) > Math.abs(big)) big = v[k];
  let s = 0;
  for (let k = 0; k < v.length; k++) s += v[k] * v[k];
  const scale = Math.sign(big || 1) / Math.sqrt(s * dxdy);
  const out = new Float64Array(v.length);
  for (let k = 0; k < v.length; k++) out[k] = v[k] * scale;
  return out;
}

/** Lowest eigenpairs of H at one energy: values (eV), unit Euclidean vectors, then the block's other vectors. */
interface LinearStates {
  readonly values: readonly number[];
  /** The `count` wanted vectors followed by the rest of the block (guards), each of unit Euclidean norm. */
  readonly block: readonly Float64Array[];
  readonly iterations: number;
  readonly converged: boolean;
  /** The V-cycle used (undefined on the dense path), for re-use on the same grid. */
  readonly preconditioner?: MultigridPreconditioner;
}

interface LinearOptions {
  readonly tolerance: number;
  readonly maxIterations: number;
  /** Energy of the masses (eV); band-edge masses when undefined. */
  readonly energy?: number;
  /** Start vectors (padded with box modes to the block size); box modes alone when undefined. */
  readonly start?: readonly Float64Array[];
  /** A V-cycle of the same grid at another energy: a 10 % change of the masses leaves it a good preconditioner, and building one costs several iterations' work. */
  readonly preconditioner?: MultigridPreconditioner;
}

/**
 * Lowest `count` eigenpairs of H with the masses at `energy`: dense Jacobi on small grids,
 * otherwise LOBPCG preconditioned by a multigrid V-cycle.
 */
function linearStates(grid: CrossSectionGrid, count: number, o: LinearOptions): LinearStates {
  const n = grid.nx * grid.ny;
  let shift = Infinity;
  for (let k = 0; k < n; k++) shift = Math.min(shift, grid.V[k]);
  const op = buildOperator(grid, shift, o.energy);
  const blockSize = Math.min(n, count + Math.max(2, Math.ceil(count / 4)));

  if (n <= DENSE_LIMIT || 6 * blockSize > n) {
    const h = new Float64Array(n * n);
    const e = new Float64Array(n);
    const col = new Float64Array(n);
    for (let k = 0; k < n; k++) {
      e.fill(0);
      e[k] = 1;
      applyStencil(op, e, col);
      for (let r = 0; r < n; r++) h[r * n + k] = col[r];
    }
    const eig = symmetricEigen(h, n);
    const block = Array.from({ length: blockSize }, (_, k) => Float64Array.from({ length: n }, (_, r) => eig.vectors[r * n + k]));
    return { values: Array.from(eig.values.subarray(0, count), (v) => v + shift), block, iterations: 0, converged: true };
  }

  const warm = o.start ? o.start.slice(0, blockSize) : [];
  const mg = o.preconditioner ?? buildMultigrid(op);
  const result = lobpcg({
    apply: (x, y) => applyStencil(op, x, y),
    precondition: (r, w) => mg.apply(r, w),
    start: warm.length < blockSize ? [...warm, ...startBlock(grid, blockSize).slice(warm.length)] : warm,
    count,
    tolerance: o.tolerance,
    maxIterations: o.maxIterations,
  });
  return {
    values: Array.from(result.values, (v) => v + shift),
    block: [...result.vectors, ...result.guards],
    iterations: result.iterations,
    converged: result.converged,
    preconditioner: mg,
  };
}

/**
 * The root p of uᵀH(p)u = p·uᵀu, the nonlinear Rayleigh functional of u (eV), by Newton's method
 * from `guess`: uᵀH(p)u − p·uᵀu decreases strictly and is convex in p for α ≥ 0 (energyForm), so
 * the iteration converges from any start. At an eigenvector of H(E) it is the Newton step of
 * E ↦ λ(H(E)) − E (Hellmann–Feynman: dλ/dE = ψᵀH′ψ).
 */
function rayleighFunctional(grid: CrossSectionGrid, u: Float64Array, guess: number): number {
  let norm = 0;
  for (let k = 0; k < u.length; k++) norm += u[k] * u[k];
  let p = guess;
  for (let it = 0; it < 60; it++) {
    const f = energyForm(grid, u, p);
    const step = (f.value / norm - p) / (f.slope / norm - 1);
    p -= step;
    if (Math.abs(step) <= 1e-14 * Math.max(1, Math.abs(p))) break;
  }
  return p;
}

/**
 * A non-parabolic state is settled when its energy is certified within this of the fixed point
 * E = λ_k(H(E)) (eV): 50 times below the default accuracy of the extrapolated edges (0.5 meV).
 * The certificate is a bound; the errors seen are 1e-9 to 1e-7 eV.
 */
const SELF_CONSISTENT_EV = 1e-5;
/** Cap on the re-solves of one non-parabolic state (one or two are typical). */
const SELF_CONSISTENT_STEPS = 8;
/** Eigenvalues closer than this (eV) count as one degenerate level in the error bound. */
const DEGENERATE_EV = 1e-7;

/**
 * Bound on |E* − p| for the fixed point E* = λ_k(H(E*)) near the Rayleigh-functional value p of u:
 * p is the Rayleigh quotient of u for H(p), so by the Kato–Temple inequality (T. Kato, J. Phys.
 * Soc. Jpn. 4, 334 (1949)) λ_k(H(p)) lies within ‖H(p)u − pu‖²/δ of p (u of unit norm), δ the
 * distance from p to the other eigenvalues (`values`, of an H at an energy close to p; a
 * degenerate level counts as one, its spread added); and λ_k(H(E)) − E falls with slope ≤ −1,
 * so E* lies no further from p than that.
 */
function fixedPointBound(grid: CrossSectionGrid, u: Float64Array, p: number, values: readonly number[], k: number): number {
  const op = buildOperator(grid, 0, p);
  const hu = new Float64Array(u.length);
  applyStencil(op, u, hu);
  let r2 = 0;
  let norm = 0;
  for (let q = 0; q < u.length; q++) {
    const d = hu[q] - p * u[q];
    r2 += d * d;
    norm += u[q] * u[q];
  }
  const { gap, spread } = separation(values, k, p);
  return r2 / norm / gap + spread;
}

/** Distance from p to the eigenvalues other than the k-th and its degenerate partners, and the spread of those partners (eV). */
function separation(values: readonly number[], k: number, p: number): { readonly gap: number; readonly spread: number } {
  let gap = Infinity;
  let spread = 0;
  values.forEach((v, j) => {
    if (j === k) return;
    if (Math.abs(v - values[k]) <= DEGENERATE_EV) spread = Math.max(spread, Math.abs(v - values[k]));
    else gap = Math.min(gap, Math.abs(v - p));
  });
  return { gap, spread };
}

/**
 * Lowest `count` subband edges (eV) and envelopes of a wire cross-section.
 *
 * Method: the 5-point BenDaniel–Duke operator H with a diagonal mass tensor, shifted by min V (so
 * it is positive definite), LOBPCG (A. V. Knyazev, SIAM J. Sci. Comput. 23, 517 (2001)) with
 * `count` + guard vectors, soft locking, Rayleigh–Ritz by a Jacobi eigen-solve, and one symmetric
 * multigrid V-cycle on the shifted H as preconditioner; grids of at most 64 nodes are
 * diagonalised densely. The discretisation error is O(h²) for smooth profiles and for sharp
 * interfaces midway between nodes. Not converging within maxIterations is reported in `status`,
 * not thrown.
 *
 * With non-parabolicity (grid.alpha) H depends on the energy through the masses, and state k
 * solves the nonlinear problem E = λ_k(H(E)). λ_k(H(E)) − E decreases strictly in E (heavier
 * masses lower every eigenvalue), so each state has one root, and the roots ascend with k. Each
 * is found by Newton's method in the form of the nonlinear Rayleigh functional (H. Voss and
 * B. Werner, Math. Methods Appl. Sci. 4, 415 (1982) for the min-max theory behind it): start
 * from the latest vector of state k (band-edge masses, or a re-solve of the state below),
 * E ← p(u), re-solve H(E) for its k + 2 lowest states from the previous vectors, E ← p(ψ_k),
 * until the Kato–Temple bound of fixedPointBound certifies E within 1e-5 eV. The envelopes of
 * different states then come from different H(E) and are orthogonal only to O(α ΔE).
 * Units: grid in nm, eV, m0; energies eV; ψ in 1/nm with Σ|ψ|² dx dy = 1.
 *
 * Example: a 10 nm × 10 nm box of mass 0.067 and V = 0 on 39 × 39 nodes (h = 0.25 nm) gives
 * E₁ = 0.112190 eV (closed form 2·ħ²π²/(2m·L²) = 0.112242 eV).
 */
export function solveCrossSection(grid: CrossSectionGrid, count: number, options: CrossSectionOptions = {}): WireStates {
  validate(grid, count);
  const tolerance = options.tolerance_eV ?? 1e-6;
  const maxIterations = options.maxIterations ?? 400;
  positive(tolerance, 'options.tolerance_eV', 'give the residual tolerance in eV');
  if (!Number.isInteger(maxIterations) || maxIterations < 1) {
    throw new InputError('bad-value', `options.maxIterations: must be a positive integer, got ${maxIterations}; give an iteration cap`, 'options.maxIterations');
  }
  const dxdy = grid.dx_nm * grid.dy_nm;
  const gridSize: readonly [number, number] = [grid.nx, grid.ny];
  const base = linearStates(grid, count, { tolerance, maxIterations, ...(grid.alpha ? { energy: options.startEnergy_eV } : {}) });
  if (grid.alpha === undefined) {
    return {
      energies: base.values,
      psi: base.block.slice(0, count).map((v) => normalise(v, dxdy)),
      iterations: base.iterations,
      gridSize,
      status: base.converged ? 'converged' : 'max-iterations',
    };
  }
  let iterations = base.iterations;
  let converged = base.converged;
  let block = base.block;
  let values = base.values;
  const n = grid.nx * grid.ny;
  const energies: number[] = [];
  const psi: Float64Array[] = [];
  for (let k = 0; k < count; k++) {
    // Each re-solve also converges state k + 1: its eigenvalue bounds the gap, and its vector starts the next state.
    const wanted = Math.min(k + 2, n);
    let energy = rayleighFunctional(grid, block[k], values[k]);
    // The vector at hand may already do: it comes from an H at a nearby energy when states lie close.
    let settled = fixedPointBound(grid, block[k], energy, values, k) <= SELF_CONSISTENT_EV;
    for (let step = 0; step < SELF_CONSISTENT_STEPS && !settled; step++) {
      // The residual that makes the bound ‖r‖²/gap a quarter of SELF_CONSISTENT_EV, from the gap seen so far: tighter is wasted work, looser needs another step.
      const target = 0.5 * Math.sqrt(SELF_CONSISTENT_EV * separation(values, k, energy).gap);
      const r = linearStates(grid, wanted, { energy, tolerance: Math.max(tolerance, target), maxIterations, start: block, preconditioner: base.preconditioner });
      iterations += r.iterations;
      converged &&= r.converged;
      block = [...r.block, ...block.slice(r.block.length)];
      values = [...r.values, ...values.slice(r.values.length)];
      energy = rayleighFunctional(grid, block[k], r.values[k]);
      settled = fixedPointBound(grid, block[k], energy, r.values, k) <= SELF_CONSISTENT_EV;
    }
    converged &&= settled;
    energies.push(energy);
    psi.push(normalise(block[k], dxdy));
  }
  return { energies, psi, iterations, gridSize, status: converged ? 'converged' : 'max-iterations' };
}

/** Rectangle of a cross-section whose edges are the Dirichlet walls (nm). */
export interface CrossSectionBox {
  readonly x0_nm: number;
  readonly y0_nm: number;
  readonly width_nm: number;
  readonly height_nm: number;
}

/** Material at a point of the cross-section: particle-sense potential (eV), masses (m0) and non-parabolicity (1/eV). */
export interface CrossSectionMaterial {
  readonly V: number;
  /** Mass along x, and along y unless massY is given (m0). */
  readonly mass: number;
  /** Mass along y (m0) where it differs. */
  readonly massY?: number;
  /** Two-band non-parabolicity α (1/eV) of m(E) = m·(1 + α(E − V)); absent or 0 for a parabolic band. */
  readonly alpha?: number;
}

/**
 * Samples a piecewise-constant cross-section onto a grid of spacing close to h inside the box.
 *
 * Nodes sit at x0 + (i + 1)·dx with dx = width / round(width / h) (same in y), so the walls are
 * the box edges. Each node takes the area-average of V and of m over its own cell, estimated on
 * `subsamples`² midpoints: a curved interface then moves the discrete energies smoothly with h
 * instead of in staircase jumps, so Richardson extrapolation is usable. The order is still not
 * clean: for the 7 nm disc of test/solver2d/circular.test.ts the l = 1 error at h = 0.5, 0.25,
 * 0.125 nm was 1.5e-4, 6.9e-5, 1.6e-5 eV (observed orders 1.1 then 2.1), and point sampling
 * (subsamples = 1) was 3–5× worse at h = 0.5 nm. A non-parabolic mass is averaged as the
 * function of energy it is: the node's m(E) = m·(1 + α(E − V)) equals the cell average of
 * m_i(1 + α_i(E − V_i)) at every E (along x; along y too when the materials of a cell share
 * their anisotropy m_y/m_x). The grid has massY only if some material has one that differs from
 * its mass, and alpha only if some α is not 0. Units: nm, eV, m0, 1/eV.
 */
export function sampleCrossSection(
  box: CrossSectionBox,
  h_nm: number,
  material: (x_nm: number, y_nm: number) => CrossSectionMaterial,
  subsamples = 4,
): CrossSectionGrid {
  positive(h_nm, 'h_nm', 'give the grid spacing in nm');
  positive(box.width_nm, 'box.width_nm', 'give the box width in nm');
  positive(box.height_nm, 'box.height_nm', 'give the box height in nm');
  if (!Number.isInteger(subsamples) || subsamples < 1) {
    throw new InputError('bad-value', `subsamples: must be a positive integer, got ${subsamples}; use 1 for point sampling`, 'subsamples');
  }
  const cellsX = Math.max(2, Math.round(box.width_nm / h_nm));
  const cellsY = Math.max(2, Math.round(box.height_nm / h_nm));
  const dx = box.width_nm / cellsX;
  const dy = box.height_nm / cellsY;
  const nx = cellsX - 1;
  const ny = cellsY - 1;
  const n = nx * ny;
  const V = new Float64Array(n);
  const mass = new Float64Array(n);
  const massY = new Float64Array(n);
  const alpha = new Float64Array(n);
  let anisotropic = false;
  let nonparabolic = false;
  const weight = 1 / (subsamples * subsamples);
  for (let j = 0; j < ny; j++) {
    const y = box.y0_nm + (j + 1) * dy;
    for (let i = 0; i < nx; i++) {
      const x = box.x0_nm + (i + 1) * dx;
      // Sums of V, m_x, m_y, m_x α, m_x α V, m_y α, m_y α V over the subsamples.
      let v = 0;
      let m = 0;
      let my = 0;
      let ma = 0;
      let maV = 0;
      let mya = 0;
      let myaV = 0;
      for (let b = 0; b < subsamples; b++) {
        for (let a = 0; a < subsamples; a++) {
          const p = material(x + ((a + 0.5) / subsamples - 0.5) * dx, y + ((b + 0.5) / subsamples - 0.5) * dy);
          const pY = p.massY ?? p.mass;
          const pa = p.alpha ?? 0;
          if (pY !== p.mass) anisotropic = true;
          if (pa !== 0) nonparabolic = true;
          v += p.V;
          m += p.mass;
          my += pY;
          ma += p.mass * pa;
          maV += p.mass * pa * p.V;
          mya += pY * pa;
          myaV += pY * pa * p.V;
        }
      }
      const k = i + nx * j;
      V[k] = v * weight;
      // Masses at E = V of the node, so that m(E) = m·(1 + α(E − V)) is the cell average at every E.
      mass[k] = (m + ma * V[k] - maV) * weight;
      massY[k] = (my + mya * V[k] - myaV) * weight;
      alpha[k] = (ma * weight) / mass[k];
    }
  }
  return {
    nx, ny, dx_nm: dx, dy_nm: dy, x0_nm: box.x0_nm + dx, y0_nm: box.y0_nm + dy, V, mass,
    ...(anisotropic ? { massY } : {}),
    ...(nonparabolic ? { alpha } : {}),
  };
}

/** Options of {@link solveCrossSectionConverged}. */
export interface ConvergedOptions {
  /** Coarsest spacing tried (nm). Default 0.5. */
  readonly h_nm?: number;
  /** Wanted accuracy of every energy (eV). Default 5e-4. */
  readonly tolerance_eV?: number;
  /** Options passed to each grid's solve. */
  readonly solver?: CrossSectionOptions;
}

/** Richardson step for an error C·h²: E(h₂) + (E(h₂) − E(h₁))/(r² − 1), r = h₁/h₂. */
const richardson = (coarse: readonly number[], fine: readonly number[], r: number): number[] =>
  fine.map((e, k) => e + (e - coarse[k]) / (r * r - 1));

const maxAbsDiff = (a: readonly number[], b: readonly number[]): number =>
  a.reduce((m, v, k) => Math.max(m, Math.abs(v - b[k])), 0);

/**
 * Subband edges extrapolated to zero grid spacing.
 *
 * Builds grids at spacing h, h/2 (and h/4 if needed) and Richardson-extrapolates the energies to
 * a target accuracy (default 0.5 meV). Richardson extrapolation (L. F. Richardson, Phil. Trans.
 * R. Soc. A 210, 307 (1911)) for a second-order scheme: E ≈ E(h/2) + (E(h/2) − E(h))/3, with the
 * actual spacing ratio of the grids used in place of 2. With two grids the error estimate is the
 * size of the correction, |E(h/2) − E(h)|/3 (largest over the states). If that exceeds the
 * tolerance a third grid is solved and the observed order p = log₂(ΔE₁/ΔE₂) checked: if every
 * state is within 1.5 ≤ p ≤ 2.5 the (h/2, h/4) extrapolation is returned with the difference of
 * the two extrapolations as its error estimate; otherwise (not clean second order) the h/4
 * energies are returned unextrapolated with the estimate |ΔE₂|/(2^p − 1), p clamped to [1, 2].
 * States, iteration count and grid size are those of the finest grid; status is 'converged' only
 * if every solve converged. `build(h)` must return the same cross-section at spacing h.
 */
export function solveCrossSectionConverged(
  build: (h_nm: number) => CrossSectionGrid,
  count: number,
  options: ConvergedOptions = {},
): WireStates & { readonly extrapolated: boolean; readonly errorEstimate_eV: number } {
  const h = options.h_nm ?? 0.5;
  const tolerance = options.tolerance_eV ?? 5e-4;
  positive(h, 'options.h_nm', 'give the coarsest grid spacing in nm');
  positive(tolerance, 'options.tolerance_eV', 'give the wanted accuracy in eV');
  const grids = [build(h), build(h / 2)];
  // A finer grid of a non-parabolic band starts at the ground energy of the coarser one.
  const states: WireStates[] = [];
  const next = (g: CrossSectionGrid): WireStates => solveCrossSection(g, count, { ...options.solver, ...(states.length > 0 ? { startEnergy_eV: states[states.length - 1]!.energies[0] } : {}) });
  for (const g of grids) states.push(next(g));
  const allConverged = (): boolean => states.every((s) => s.status === 'converged');
  const iterations = (): number => states.reduce((t, s) => t + s.iterations, 0);
  const r1 = grids[0].dx_nm / grids[1].dx_nm;
  const first = richardson(states[0].energies, states[1].energies, r1);
  const correction1 = maxAbsDiff(first, states[1].energies);
  if (correction1 <= tolerance) {
    return {
      ...states[1],
      energies: first,
      iterations: iterations(),
      status: allConverged() ? 'converged' : 'max-iterations',
      extrapolated: true,
      errorEstimate_eV: correction1,
    };
  }
  grids.push(build(h / 4));
  states.push(next(grids[2]));
  const r2 = grids[1].dx_nm / grids[2].dx_nm;
  const [e0, e1, e2] = states.map((s) => s.energies);
  const orders = e2.map((e, k) => Math.log(Math.abs((e1[k] - e0[k]) / (e - e1[k]))) / Math.log(r2));
  const finest = states[2];
  const base = { ...finest, iterations: iterations(), status: allConverged() ? ('converged' as const) : ('max-iterations' as const) };
  if (orders.every((p) => p >= 1.5 && p <= 2.5)) {
    const second = richardson(e1, e2, r2);
    return { ...base, energies: second, extrapolated: true, errorEstimate_eV: maxAbsDiff(second, first) };
  }
  const errorEstimate = e2.reduce((m, e, k) => {
    const p = Math.min(2, Math.max(1, Number.isFinite(orders[k]) ? orders[k] : 1));
    return Math.max(m, Math.abs(e - e1[k]) / (r2 ** p - 1));
  }, 0);
  return { ...base, extrapolated: false, errorEstimate_eV: errorEstimate };
}
