/**
 * Interband momentum matrix elements of a well: the Kane energy Ep of every layer and the
 * polarisation factors of a conduction–valence pair from the hole state's spinor components.
 *
 * Bloch part (E. O. Kane, J. Phys. Chem. Solids 1, 249 (1957); common practice): the conduction
 * band edge |S, s⟩ couples to the valence orbitals by P = ⟨S|p_x|X⟩ = ⟨S|p_y|Y⟩ = ⟨S|p_z|Z⟩, with
 * Ep = 2P²/m0. A hole state with T(φ)-basis amplitudes a_c (hamiltonian.ts) is, in the orbital ⊗
 * spin basis, V_{α,s} = Σ_c Q_{(α,s),c} a_c (Q = blochBasis), so Σ_s |⟨S,s|ê·p|v⟩|² =
 * P² Σ_s |Σ_α ê_α V_{α,s}|². The factors below are that sum over the bulk average
 * M_b² = P²/3 = m0 Ep/6: TE = (3/2) Σ_s (|V_{x,s}|² + |V_{y,s}|²) (ê in the plane; the average over
 * ê along x and y equals any in-plane ê once k∥ is averaged over the cubic directions), TM =
 * 3 Σ_s |V_{z,s}|². At k∥ = 0 a pure heavy hole gives TE 3/2, TM 0; a light hole 1/2 and 2; a
 * split-off hole 1 and 1 (S. L. Chuang, Physics of Optoelectronic Devices, Wiley 1995, Table 9.1;
 * L. A. Coldren and S. W. Corzine, Diode Lasers and Photonic Integrated Circuits, Wiley 1995,
 * App. 8; both from memory).
 *
 * Envelope part: the amplitudes are the envelope overlaps a_c = ∫ φ_e(z) √Ep(z) ψ_c(z) dz, so a
 * structure whose layers differ in Ep weights each layer's share by its own P (our choice; with
 * one Ep it is Ep·|overlap|²), and the factors carry Ep in eV: |ê·p_cv|² = (m0/6)·factor.
 */
import { alloyAt } from '../../materials/index.js';
import { InputError } from '../errors.js';
import { mixAlloys, type ResolvedLayer, type Structure } from '../structure.js';
import type { ValenceModel } from '../valence/hamiltonian.js';
import { blochBasis } from '../valence/hamiltonian.js';

/**
 * Kane energy Ep (eV) of a layer at fraction t (0…1) through it: the alloy's interpolated Ep
 * (materials/alloys.ts, VMR2001 values and bowing); a custom material's from the three-band Kane
 * mass without remote bands, m0/me − 1 = (Ep/3)(2/Eg + 1/(Eg + Δ)) (Kane 1957; Δ = ∞ when the
 * material gives none). `override` (eV) replaces every layer's value.
 */
export function kaneEnergy(layer: ResolvedLayer, t: number, structure: Structure, override?: number): number {
  if (override !== undefined) return override;
  const c = layer.composition;
  if (c.kind !== 'custom') {
    const alloy = c.kind === 'alloy' ? c.alloy : mixAlloys(c.from, c.to, t);
    return alloyAt(alloy, structure.temperature_K, structure.models.lattice).Ep;
  }
  const m = layer.material;
  const Eg = m.EgG;
  const inverse = 2 / Eg + (Number.isFinite(m.Dso) ? 1 / (Eg + m.Dso) : 0);
  const Ep = (3 * (1 / m.me - 1)) / inverse;
  if (!(Ep > 0) || !Number.isFinite(Ep)) {
    throw new InputError('bad-value', `optics.kane_energy: layer ${layer.label} (${layer.formula}) is a custom material whose Kane energy cannot follow from its mass (me = ${m.me} m0, Eg = ${Eg} eV); give optics.kane_energy in eV, e.g. 25 eV`, 'optics.kane_energy');
  }
  return Ep;
}

/** Ep (eV) at each z (nm, from the first layer's start) of a structure; beyond the stack, the outer layers'. */
export function kaneEnergyOnGrid(structure: Structure, z_nm: ArrayLike<number>, override?: number): Float64Array {
  const out = new Float64Array(z_nm.length);
  const layers = structure.layers;
  let k = 0;
  let start = 0;
  // Uniform layers are evaluated once; graded ones at each sample's fraction.
  const uniform = layers.map((l) => (l.composition.kind === 'graded' ? NaN : kaneEnergy(l, 0.5, structure, override)));
  for (let i = 0; i < z_nm.length; i++) {
    const z = z_nm[i]!;
    while (k + 1 < layers.length && z > start + layers[k]!.thickness_nm) {
      start += layers[k]!.thickness_nm;
      k++;
    }
    const l = layers[k]!;
    const t = Math.min(Math.max((z - start) / l.thickness_nm, 0), 1);
    out[i] = Number.isNaN(uniform[k]!) ? kaneEnergy(l, t, structure, override) : uniform[k]!;
  }
  return out;
}

/** TE and TM factors of one pair (see the module comment): eV when the amplitudes carry √Ep. */
export interface PolarisationFactors {
  readonly te: number;
  readonly tm: number;
}

/** The orbital ⊗ spin basis of a direction, cached per (model, φ). */
const bases = new Map<string, ReturnType<typeof blochBasis>>();
function basisOf(model: ValenceModel, phi: number): ReturnType<typeof blochBasis> {
  const key = `${model}|${phi}`;
  let b = bases.get(key);
  if (!b) {
    b = blochBasis(model, phi);
    if (bases.size > 64) bases.clear();
    bases.set(key, b);
  }
  return b;
}

/**
 * TE and TM factors of a hole state with real T(φ)-basis amplitudes `a` (length 4 for kp4, 6 for
 * kp6) for k∥ along φ (rad): the formulas of the module comment.
 * Example: a = [1, 0, 0, 0] (kp4, the heavy-hole component) → TE 1.5, TM 0.
 */
export function polarisationFactors(model: ValenceModel, phi: number, a: ArrayLike<number>): PolarisationFactors {
  const Q = basisOf(model, phi);
  const d = Q.cols;
  let inPlane = 0;
  let normal = 0;
  // Rows (X↑, Y↑, Z↑, X↓, Y↓, Z↓).
  for (let r = 0; r < 6; r++) {
    let re = 0;
    let im = 0;
    for (let c = 0; c < d; c++) {
      const x = a[c]!;
      if (x === 0) continue;
      re += Q.re[r * d + c]! * x;
      im += Q.im[r * d + c]! * x;
    }
    const v2 = re * re + im * im;
    if (r % 3 === 2) normal += v2;
    else inPlane += v2;
  }
  return { te: 1.5 * inPlane, tm: 3 * normal };
}

/** k∥ = 0 factors of the single-band (parabolic) hole model: pure heavy or light holes. */
export const EDGE_FACTORS: Readonly<Record<'hh' | 'lh', PolarisationFactors>> = { hh: { te: 1.5, tm: 0 }, lh: { te: 0.5, tm: 2 } };
