/**
 * The Poisson step of a doped stack: the mesh (nodes on every interface, each layer cut evenly),
 * the charge of dopants and carriers as nodal loads, and the electrostatic potential energy of an
 * electron, U = −eφ, from
 *   d/dz (ε_r(z) dU/dz) = (e/ε0) c(z),
 * c the net positive charge density (ionised donors − electrons + holes − ionised acceptors, nm⁻³),
 * ε_r the layers' static permittivities (materials/dielectric.ts). Positive charge makes U convex:
 * a well for electrons.
 *
 * Boundary conditions (stated): no displacement field at the first layer's start (ε U′ = 0) and
 * U = 0 there. A neutral stack (what the self-consistent solve makes it) then has no field at its
 * last layer's end either: the stack sits between field-free, neutral contacts, and an applied bias
 * is the linear potential of the structure's field added on top (engine/poisson/bias.ts).
 *
 * Method: linear finite elements on the mesh, the loads c·hat integrated exactly for dopants
 * (uniform segments and delta sheets at any position) and by Simpson's rule for carriers. Solved
 * by integrating Gauss's law element by element, ε_e (U_{k+1} − U_k)/h_e = (e/ε0) Σ_{j≤k} b_j,
 * which is the finite-element system itself (its rows summed from the left). In one dimension
 * linear elements are exact at the nodes for any load integrated exactly (the Green's function is
 * piecewise linear between nodes when ε jumps only at nodes; G. Strang and G. J. Fix, An Analysis
 * of the Finite Element Method (1973), §1.10, from memory), so a sheet's linear field and a doped
 * slab's parabola come out exact at every node whatever the mesh.
 * Units: z nm, U eV, densities nm⁻³ and nm⁻², loads nm⁻².
 */
import { EPSILON0_F_PER_M, ELEMENTARY_CHARGE_C } from '../constants.js';
import { InputError } from '../errors.js';
import type { DopingProfile } from './doping.js';

/** e/ε0 in V·nm: U″ ε_r = E_OVER_EPS0 · c with U in eV and c in nm⁻³ (CODATA 2018 e and ε0). */
export const E_OVER_EPS0_V_NM = (ELEMENTARY_CHARGE_C / EPSILON0_F_PER_M) * 1e9;

/**
 * Default largest element (nm): e1, e2, E_F and U move by at most 0.033 meV down to 0.125 nm
 * (test/poisson/selfconsistent.test.ts), the potential being linear between nodes where the charge
 * bends it by (e/ε0) n h²/(12 ε_r) (0.036 meV for 1e12 cm⁻² in 8 nm).
 */
export const DEFAULT_MESH_NM = 0.5;

export interface PoissonMesh {
  /** Node positions (nm), from 0 to the stack's total thickness; every interface is a node. */
  readonly z: Float64Array;
  /** Relative static permittivity of each element. */
  readonly eps: Float64Array;
  /** Elements per layer (each layer is cut into this many equal elements). */
  readonly perLayer: readonly number[];
  /** Index of each layer's first node. */
  readonly firstNode: readonly number[];
}

/** Elements a layer of this thickness is cut into for a largest element h (the profile builder's own rule, so slices and elements coincide). */
export const elementsOf = (thickness_nm: number, h_nm: number): number => Math.max(1, Math.ceil(thickness_nm / h_nm - 1e-9));

/**
 * The mesh of a stack: each layer cut into elementsOf(thickness, h) equal elements.
 * Throws InputError when a layer's permittivity is unknown (a custom material without one).
 */
export function poissonMesh(layers: readonly { readonly thickness_nm: number; readonly permittivity: number; readonly formula?: string }[], h_nm: number): PoissonMesh {
  if (!(h_nm > 0) || !Number.isFinite(h_nm)) throw new InputError('bad-value', `doping.mesh: must be a positive length in nm, got ${h_nm}`, 'doping.mesh');
  const perLayer = layers.map((l) => elementsOf(l.thickness_nm, h_nm));
  const n = perLayer.reduce((a, b) => a + b, 0);
  const z = new Float64Array(n + 1);
  const eps = new Float64Array(n);
  const firstNode: number[] = [];
  let k = 0;
  let z0 = 0;
  layers.forEach((l, i) => {
    if (!(l.permittivity > 0)) {
      const name = l.formula ?? `layer ${i + 1}`;
      throw new InputError('bad-value', `materials.${name}.permittivity: the electrostatics of a doped stack needs every layer's static permittivity, got none for ${name}; give "permittivity:" in its custom material`, `materials.${name}.permittivity`);
    }
    firstNode.push(k);
    const m = perLayer[i]!;
    for (let j = 0; j < m; j++) {
      z[k] = z0 + (l.thickness_nm * j) / m;
      eps[k] = l.permittivity;
      k++;
    }
    z0 += l.thickness_nm;
  });
  z[n] = z0;
  return { z, eps, perLayer, firstNode };
}

/** Index of the element holding z (nm): the last element whose left node is at or before z. */
function elementAt(z: Float64Array, x: number): number {
  let lo = 0;
  let hi = z.length - 2;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (z[mid]! <= x) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/**
 * Nodal loads of the dopants, b_k = ∫ c(z) hat_k(z) dz (nm⁻²), exact: a uniform segment over
 * [c, d] inside element [a, b] (width h) gives ρ∫(b − z)/h to node a and ρ∫(z − a)/h to node b; a
 * sheet at z_s gives its density times the two hat values there.
 */
export function dopingLoads(mesh: PoissonMesh, doping: DopingProfile): Float64Array {
  const { z } = mesh;
  const b = new Float64Array(z.length);
  for (const s of doping.segments) {
    for (let e = elementAt(z, s.z0_nm); e < z.length - 1 && z[e]! < s.z1_nm; e++) {
      const a = z[e]!;
      const h = z[e + 1]! - a;
      const lo = Math.max(a, s.z0_nm) - a;
      const hi = Math.min(z[e + 1]!, s.z1_nm) - a;
      if (!(hi > lo)) continue;
      const right = (s.density_nm3 * (hi * hi - lo * lo)) / (2 * h);
      b[e] += s.density_nm3 * (hi - lo) - right;
      b[e + 1] += right;
    }
  }
  for (const s of doping.sheets) {
    const e = elementAt(z, s.z_nm);
    const t = (s.z_nm - z[e]!) / (z[e + 1]! - z[e]!);
    b[e] += s.density_nm2 * (1 - t);
    b[e + 1] += s.density_nm2 * t;
  }
  return b;
}

/**
 * U at the nodes (eV) for nodal loads b (nm⁻², net positive charge): U(0) = 0, no field at the
 * first node (see the module comment). A non-neutral load leaves a field E_OVER_EPS0·Σb/ε at the
 * last node, as Gauss's law says.
 */
export function solvePoisson(mesh: PoissonMesh, loads: ArrayLike<number>): Float64Array {
  const { z, eps } = mesh;
  const U = new Float64Array(z.length);
  let enclosed = 0;
  for (let e = 0; e < z.length - 1; e++) {
    enclosed += loads[e]!;
    U[e + 1] = U[e]! + (E_OVER_EPS0_V_NM * enclosed * (z[e + 1]! - z[e]!)) / eps[e]!;
  }
  return U;
}
