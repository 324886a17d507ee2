/**
 * Value types of the wire cross-section solver: the discretised cross-section it accepts and the
 * states it returns. Energies eV, lengths nm, masses m0.
 */

/** A wire cross-section sampled on a uniform rectangular grid of interior nodes. */
export interface CrossSectionGrid {
  /** Interior nodes along x and y; ψ = 0 on the surrounding ring of boundary nodes. */
  readonly nx: number;
  readonly ny: number;
  /** Node spacings (nm). */
  readonly dx_nm: number;
  readonly dy_nm: number;
  /** Coordinates of node (0, 0) (nm); the Dirichlet wall lies `wall_nm` further out. */
  readonly x0_nm: number;
  readonly y0_nm: number;
  /**
   * Distance (nm) from the outermost nodes to the Dirichlet wall, along x and along y (the same on
   * both sides). Default one spacing: the wall is the ring of boundary nodes around the grid. A
   * cell-centred grid whose cells tile the box has half a spacing (sampleCrossSection).
   */
  readonly wall_nm?: readonly [number, number];
  /** Particle-sense potential at the nodes (eV), index i + nx·j. */
  readonly V: Float64Array;
  /**
   * Effective mass at the nodes (m0), index i + nx·j: along x, and along y too unless `massY` is
   * given. With `alpha` it is the mass at the node's band edge (E = V).
   */
  readonly mass: Float64Array;
  /** Mass along y (m0) where it differs from the mass along x: a diagonal mass tensor (anisotropic hole masses). */
  readonly massY?: Float64Array;
  /**
   * Non-parabolicity α (1/eV) at the nodes: both masses become m(E) = m·(1 + α(E − V)) (two-band
   * form, as in engine/solver1d/slices.ts) and each state's energy solves E = λ(H(E)). Absent: parabolic.
   */
  readonly alpha?: Float64Array;
}

/** Bound states of the cross-section, lowest first. */
export interface WireStates {
  /** Subband-edge energies (eV), ascending. */
  readonly energies: readonly number[];
  /** Envelopes at the nodes (1/nm), index i + nx·j, normalised Σ|ψ|² dx dy = 1. */
  readonly psi: readonly Float64Array[];
  /** Eigen-solver iterations spent (summed over grids, and over the re-solves of a non-parabolic band). */
  readonly iterations: number;
  /** Interior nodes [nx, ny] of the grid the states belong to. */
  readonly gridSize: readonly [number, number];
  readonly status: 'converged' | 'max-iterations';
}
