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
import { applyStencil, applyStencilColumns, buildOperator, energyForm } from './solver2d/operator.js';
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
  /** Start vectors on this grid (e.g. another grid's states carried over by prolongCellCentred); box modes fill the rest of the block. Only the work depends on them. */
  readonly start?: readonly Float64Array[];
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
  if (grid.wall_nm !== undefined) {
    positive(grid.wall_nm[0], 'grid.wall_nm[0]', 'give the distance from the outer nodes to the wall in nm');
    positive(grid.wall_nm[1], 'grid.wall_nm[1]', 'give the distance from the outer nodes to the wall in nm');
  }
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
    // As in engine/solver1d/slices.ts: the two-band mass must stay positive for every energy a state of the grid can have, [min V, max V].
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

/** Distance from the outer nodes to the wall along x and y (nm): grid.wall_nm, or one spacing. */
const walls = (grid: CrossSectionGrid): readonly [number, number] => grid.wall_nm ?? [grid.dx_nm, grid.dy_nm];

/**
 * Mode numbers (p, q) of the lowest Dirichlet-box modes sin(pπ ξ_i/Lx) sin(qπ η_j/Ly), ξ_i the
 * node's distance from the wall and L the wall-to-wall length, ordered by p²/Lx² + q²/Ly².
 */
function boxModes(grid: CrossSectionGrid, size: number): [number, number][] {
  const { nx, ny } = grid;
  const [wx, wy] = walls(grid);
  const lx = (nx - 1) * grid.dx_nm + 2 * wx;
  const ly = (ny - 1) * grid.dy_nm + 2 * wy;
  const modes: [number, number][] = [];
  for (let q = 1; q <= Math.min(ny, size); q++) for (let p = 1; p <= Math.min(nx, size); p++) modes.push([p, q]);
  modes.sort((a, b) => a[0] ** 2 / lx ** 2 + a[1] ** 2 / ly ** 2 - (b[0] ** 2 / lx ** 2 + b[1] ** 2 / ly ** 2));
  return modes.slice(0, size);
}

/** sin(mode·π(wall + i·h)/L) for i = 0 … count − 1, L = (count − 1)·h + 2·wall: the box mode along an axis. */
const sines = (count: number, mode: number, h: number, wall: number): Float64Array =>
  Float64Array.from({ length: count }, (_, i) => Math.sin((mode * Math.PI * (wall + i * h)) / ((count - 1) * h + 2 * wall)));

/**
 * Deterministic start block: the lowest box modes, each perturbed by 1 % of a fixed-seed mixture
 * of the lowest 2·size box modes so that every wanted state is represented whatever the symmetry of the
 * cross-section. Smooth modes rather than white noise, which would put a large residual into every
 * vector. Every mode is a product of 1-D sines, so each vector is summed as Σ_q u_q(x) sin_q(y),
 * one pass over the grid per distinct q. Returns vectors `from` … size − 1 of the block, the same
 * whatever `from` (the draws of the vectors before it are skipped): the guard vectors behind
 * states carried over from a coarser grid.
 */
function startBlock(grid: CrossSectionGrid, size: number, from = 0): Float64Array[] {
  const { nx, ny } = grid;
  const extra = boxModes(grid, 2 * size);
  // Tables indexed by mode number (entry 0 unused).
  const [wx, wy] = walls(grid);
  const sx = Array.from({ length: 1 + Math.max(...extra.map((m) => m[0])) }, (_, p) => sines(nx, p, grid.dx_nm, wx));
  const sy = Array.from({ length: 1 + Math.max(...extra.map((m) => m[1])) }, (_, q) => sines(ny, q, grid.dy_nm, wy));
  const peak = (v: Float64Array): number => v.reduce((m, x) => Math.max(m, Math.abs(x)), 0);
  const random = seeded(20010517);
  for (let d = 0; d < from * extra.length; d++) random();
  return extra.slice(from, size).map(([p, q]) => {
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
    applyBlock: (x, y) => applyStencilColumns(op, x, y),
    precondition: (r, w) => mg.apply([r], [w]),
    preconditionBlock: (r, w) => mg.apply(r, w),
    start: warm.length < blockSize ? [...warm, ...startBlock(grid, blockSize, warm.length)] : warm,
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
  // With no other eigenvalue known (a block of one state) nothing bounds the distance: not settled,
  // so the caller re-solves for the state above as well (a lone state was returned unrefined).
  if (!Number.isFinite(gap)) return r2 === 0 ? spread : Infinity;
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
  const base = linearStates(grid, count, { tolerance, maxIterations, ...(grid.alpha ? { energy: options.startEnergy_eV } : {}), ...(options.start ? { start: options.start } : {}) });
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
 * Samples a piecewise-constant cross-section onto a cell-centred grid of spacing close to h inside
 * the box (h one spacing for both axes, or [h_x, h_y]).
 *
 * The box is cut into round(width / h_x) × round(height / h_y) cells; the nodes are their centres,
 * x0 + (i + ½)·dx (same in y), and the walls are the box edges, half a spacing beyond the outer
 * nodes (wall_nm). An interface that falls on a cell face then sits midway between two nodes,
 * where the operator's flux is exact, and the error expands cleanly in h²: for the 10 nm GaAs square
 * of test/reference/solver2d/square_wire.json the observed orders are 1.93–2.14 from h = 1 nm down
 * and 1.997–2.001 below 0.25 nm (nodes on the interfaces, the grid before, gave 1.5–2.3). Each node
 * takes the area-average of V and of m over its own cell, estimated on `subsamples`² midpoints: a
 * curved interface then moves the discrete energies smoothly with h instead of in staircase jumps,
 * so Richardson extrapolation is usable, though its order is not clean (for the 7 nm disc of
 * test/solver2d/circular.test.ts point sampling was 3–5× worse at h = 0.5 nm). A non-parabolic mass is averaged as the
 * function of energy it is: the node's m(E) = m·(1 + α(E − V)) equals the cell average of
 * m_i(1 + α_i(E − V_i)) at every E (along x; along y too when the materials of a cell share
 * their anisotropy m_y/m_x). The grid has massY only if some material has one that differs from
 * its mass, and alpha only if some α is not 0. Units: nm, eV, m0, 1/eV.
 */
export function sampleCrossSection(
  box: CrossSectionBox,
  h_nm: number | readonly [number, number],
  material: (x_nm: number, y_nm: number) => CrossSectionMaterial,
  subsamples = 4,
): CrossSectionGrid {
  const [hx, hy] = typeof h_nm === 'number' ? [h_nm, h_nm] : h_nm;
  positive(hx, 'h_nm', 'give the grid spacing in nm');
  positive(hy, 'h_nm', 'give the grid spacing in nm');
  positive(box.width_nm, 'box.width_nm', 'give the box width in nm');
  positive(box.height_nm, 'box.height_nm', 'give the box height in nm');
  if (!Number.isInteger(subsamples) || subsamples < 1) {
    throw new InputError('bad-value', `subsamples: must be a positive integer, got ${subsamples}; use 1 for point sampling`, 'subsamples');
  }
  const nx = Math.max(2, Math.round(box.width_nm / hx));
  const ny = Math.max(2, Math.round(box.height_nm / hy));
  const dx = box.width_nm / nx;
  const dy = box.height_nm / ny;
  const n = nx * ny;
  const V = new Float64Array(n);
  const mass = new Float64Array(n);
  const massY = new Float64Array(n);
  const alpha = new Float64Array(n);
  let anisotropic = false;
  let nonparabolic = false;
  const weight = 1 / (subsamples * subsamples);
  for (let j = 0; j < ny; j++) {
    const y = box.y0_nm + (j + 0.5) * dy;
    for (let i = 0; i < nx; i++) {
      const x = box.x0_nm + (i + 0.5) * dx;
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
    nx, ny, dx_nm: dx, dy_nm: dy, x0_nm: box.x0_nm + 0.5 * dx, y0_nm: box.y0_nm + 0.5 * dy, wall_nm: [0.5 * dx, 0.5 * dy], V, mass,
    ...(anisotropic ? { massY } : {}),
    ...(nonparabolic ? { alpha } : {}),
  };
}

/** Options of {@link solveCrossSectionConverged}. */
export interface ConvergedOptions {
  /** Spacing h of the first grid kept (nm): grids h and h/2 (h/4 if needed) give the energies, 2h only the error estimate. Default 0.5. */
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
 * Divisor turning the change between two successive extrapolations into the error of the finer:
 * after the h² term is removed the error falls at least third order (fourth where the profile is
 * aligned with the cells), so |R(h, h/2) − R(2h, h)| ≥ (2³ − 1)·|R(h, h/2) − E|. Measured on the
 * 10 nm GaAs square (test/reference/solver2d/square_wire.json): true errors of R(0.5, 0.25) of
 * 2.1–6.6 µV against estimates of 3.9–14.5 µV (the correction |E(h/2) − E(h)|/3 was 140–360 µV).
 */
const NEXT_ORDER_DIVISOR = 7;

/** Observed orders log(|E(a) − E(b)| / |E(b) − E(c)|)/log r of three grids, and whether every state is clean second order. */
function cleanOrder(a: readonly number[], b: readonly number[], c: readonly number[], r: number): boolean {
  return c.every((e, k) => {
    const p = Math.log(Math.abs((b[k]! - a[k]!) / (e - b[k]!))) / Math.log(r);
    return p >= 1.5 && p <= 2.5;
  });
}

/**
 * Subband edges extrapolated to zero grid spacing.
 *
 * Solves cell-centred grids at spacing h and h/2 and Richardson-extrapolates, E ≈ E(h/2) +
 * (E(h/2) − E(h))/3 with the actual spacing ratio in place of 2 (L. F. Richardson, Phil. Trans.
 * R. Soc. A 210, 307 (1911)). The error of that value is estimated from a third, coarser grid at
 * 2h (a quarter of h's nodes): when the three show clean second order (1.5 ≤ p ≤ 2.5 for every
 * state) it is |R(h, h/2) − R(2h, h)|/NEXT_ORDER_DIVISOR, an honest bound; otherwise (the 2h grid too
 * coarse to resolve the shape) the size of the correction, |E(h/2) − E(h)|/3. Only if that exceeds
 * the tolerance (default 0.5 meV) is h/4 solved, and (h/2, h/4) extrapolated with the estimate from
 * (h, h/2, h/4) the same way; if those are not clean second order, the h/4 energies are returned
 * unextrapolated with |ΔE|/(2^p − 1), p clamped to [1, 2]. The grids are solved coarsest first
 * (2h, h, h/2, h/4), each starting from the states of the one before it prolonged
 * (prolongCellCentred): on the 10 nm square of test/reference/solver2d/square_wire.json at
 * h = 0.5 nm that took the h grid from 11 LOBPCG iterations to 9 and the h/2 grid from 14 to 10.
 * The coarser grids serve the energies alone, so they are solved to a residual whose energy error
 * ‖r‖²/gap stays far below the tolerance. States, grid size and iteration count are those of the finest grid (iterations summed
 * over all); status is 'converged' only if every solve converged. `build(h)` must return the same
 * cross-section at spacing h.
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
  const base = options.solver?.tolerance_eV ?? 1e-6;
  // ‖r‖ with ‖r‖²/gap ≤ tolerance/100 for a gap of 1 meV: energies of the grids whose vectors are not
  // kept, which enter the result with weight 1/3 (h) or only its estimate (2h). The bound is loose:
  // on the square of test/reference/solver2d/square_wire.json, grids 1 and 0.5 nm at ‖r‖ = 3.2e-5 eV
  // gave energies within 1.1e-9 eV of the fully converged ones.
  const loose = Math.max(base, Math.sqrt(1e-5 * tolerance));
  let last: WireStates | undefined;
  // A finer grid of a non-parabolic band starts at the ground energy of the grid solved before it.
  // A grid of twice the cells of the one solved before it starts from that grid's states, prolonged.
  const solve = (g: CrossSectionGrid, keepVectors: boolean): WireStates => {
    const [px, py] = last?.gridSize ?? [0, 0];
    const start = g.wall_nm !== undefined && g.nx === 2 * px && g.ny === 2 * py ? last!.psi.map((v) => prolongCellCentred(v, px, py)) : undefined;
    const s = solveCrossSection(g, count, { ...options.solver, tolerance_eV: keepVectors ? base : loose, ...(last ? { startEnergy_eV: last.energies[0] } : {}), ...(start ? { start } : {}) });
    last = s;
    return s;
  };
  // Coarsest first, so that each finer grid starts from the states of the one before it.
  const g2h = build(2 * h);
  const s2h = solve(g2h, false);
  const gh = build(h);
  const sh = solve(gh, false);
  const gh2 = build(h / 2);
  const sh2 = solve(gh2, true);
  const solved = [s2h, sh, sh2];
  const status = (): 'converged' | 'max-iterations' => (solved.every((s) => s.status === 'converged') ? 'converged' : 'max-iterations');
  const iterations = (): number => solved.reduce((t, s) => t + s.iterations, 0);
  const r1 = gh.dx_nm / gh2.dx_nm;
  const r0 = g2h.dx_nm / gh.dx_nm;
  const first = richardson(sh.energies, sh2.energies, r1);
  const estimate1 = cleanOrder(s2h.energies, sh.energies, sh2.energies, r1)
    ? maxAbsDiff(first, richardson(s2h.energies, sh.energies, r0)) / NEXT_ORDER_DIVISOR
    : maxAbsDiff(first, sh2.energies);
  if (estimate1 <= tolerance) {
    return { ...sh2, energies: first, iterations: iterations(), status: status(), extrapolated: true, errorEstimate_eV: estimate1 };
  }
  const gh4 = build(h / 4);
  const sh4 = solve(gh4, true);
  solved.push(sh4);
  const r2 = gh2.dx_nm / gh4.dx_nm;
  const [e0, e1, e2] = [sh.energies, sh2.energies, sh4.energies];
  const base4 = { ...sh4, iterations: iterations(), status: status() };
  if (cleanOrder(e0, e1, e2, r2)) {
    const second = richardson(e1, e2, r2);
    return { ...base4, energies: second, extrapolated: true, errorEstimate_eV: maxAbsDiff(second, first) / NEXT_ORDER_DIVISOR };
  }
  const errorEstimate = e2.reduce((m, e, k) => {
    const p = Math.log(Math.abs((e1[k]! - e0[k]!) / (e - e1[k]!))) / Math.log(r2);
    const q = Math.min(2, Math.max(1, Number.isFinite(p) ? p : 1));
    return Math.max(m, Math.abs(e - e1[k]!) / (r2 ** q - 1));
  }, 0);
  return { ...base4, extrapolated: false, errorEstimate_eV: errorEstimate };
}

/**
 * A vector of a cell-centred grid carried to the grid of twice as many cells along each axis, by
 * bilinear interpolation between cell centres: a fine centre lies a quarter of a coarse cell from
 * its parent's centre, so it takes 9/16 of its parent, 3/16 of each neighbour along x and y and 1/16
 * of the diagonal one; beyond the wall the neighbour is the ghost −parent (ψ = 0 on the face).
 * Units follow the vector.
 */
export function prolongCellCentred(v: Float64Array, nx: number, ny: number): Float64Array {
  const out = new Float64Array(4 * nx * ny);
  const fx = 2 * nx;
  const at = (i: number, j: number, pi: number, pj: number): number => {
    const ci = Math.min(Math.max(i, -1), nx);
    const cj = Math.min(Math.max(j, -1), ny);
    // A neighbour outside the grid is the ghost of the parent across the wall.
    if (ci < 0 || ci >= nx || cj < 0 || cj >= ny) return -v[pi + nx * pj]!;
    return v[ci + nx * cj]!;
  };
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const c = v[i + nx * j]!;
      for (let b = 0; b < 2; b++) {
        const nj = j + (b === 0 ? -1 : 1);
        for (let a = 0; a < 2; a++) {
          const ni = i + (a === 0 ? -1 : 1);
          out[2 * i + a + fx * (2 * j + b)] = (9 * c + 3 * at(ni, j, i, j) + 3 * at(i, nj, i, j) + at(ni, nj, i, j)) / 16;
        }
      }
    }
  }
  return out;
}
