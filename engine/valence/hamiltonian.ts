/**
 * Luttinger–Kohn valence Hamiltonian of a (001) layer: the 4×4 (heavy and light holes) and 6×6
 * (with the split-off band) k·p forms with (001) biaxial strain, written as coefficient matrices of
 * a z-dependent operator so that a layered structure can be discretised with a Hermitian ordering.
 *
 * For one in-plane wave vector k∥ = k (cos φ, sin φ) and one layer the operator is
 *   H = A(k∥) + B(k∥) k_z + k_z B(k∥)† + k_z C k_z,      k_z = −i d/dz,
 * in the ordering of M. G. Burt, J. Phys.: Condens. Matter 4, 6651 (1992) and B. A. Foreman,
 * Phys. Rev. B 48, 4964 (1993); 56, R12748 (1997) (from memory). It is built in the spinless
 * (X, Y, Z) basis, where the second-order term is Σ k_α D^{αβ} k_β with
 *   H_XX = k_x L k_x + k_y M k_y + k_z M k_z   (and cyclic),
 *   H_XY = k_x N⁺ k_y + k_y N⁻ k_x,   H_XZ = k_x N⁺ k_z + k_z N⁻ k_x,   H_YZ = k_y N⁺ k_z + k_z N⁻ k_y,
 * in units of ħ²/2m0 and electron energies (holes below), with L = −γ1 − 4γ2, M = −γ1 + 2γ2,
 * N = N⁺ + N⁻ = −6γ3 (the Luttinger parameters, J. M. Luttinger, Phys. Rev. 102, 1030 (1956)) and
 * Foreman's split N⁻ = M − 1 (the free-electron term; remote Γ25 bands neglected), so
 * N⁺ = γ1 − 2γ2 − 6γ3 + 1. Why this ordering: it follows from the envelope-function theory of the
 * abrupt interface (left momentum matrix element with the left k), and, unlike the symmetrised
 * ordering {γ3, k_z}/2, it keeps the interface term that couples heavy and light holes at k∥ ≠ 0 in
 * the asymmetric form the theory gives; at k∥ = 0 both reduce to −d/dz (1/m) d/dz, i.e. ψ and ψ′/m
 * continuous, exactly the single-band BenDaniel–Duke condition of engine/solver1d/slices.ts.
 *
 * Band edges: the strained edges of the structure enter as a diagonal (X, Y, Z) term
 * diag(u, u, w) that puts |3/2, ±3/2⟩ at u = E_hh. In the 4×4 model w = (3E_lh − E_hh)/2 puts
 * |3/2, ±1/2⟩ at the structure's E_lh, which already includes the k = 0 coupling to the split-off
 * band (materials/strain.ts lightHoleShift). In the 6×6 model w = E_v + 2Q_ε with E_v = E_hh + Q_ε,
 * plus −Δso on |1/2, ±1/2⟩, gives the Bir–Pikus edges of S. L. Chuang, Phys. Rev. B 43, 9649 (1991)
 * and Physics of Optoelectronic Devices (Wiley), Sec. 4.5–4.6 (from memory): hh at E_v − Q_ε, and
 * the lh–so pair [[E_v + Q_ε, √2 Q_ε], [√2 Q_ε, E_v − Δ]] (up to the sign of the coupling, which
 * depends on the basis phases). Bulk at k_z as a number this is Chuang's P, Q, R, S form.
 *
 * Basis: |j, m⟩ from (X, Y, Z) ⊗ spin by Clebsch–Gordan coefficients (Condon–Shortley phases),
 * ordered (3/2, 3/2), (3/2, 1/2), (3/2, −1/2), (3/2, −3/2), (1/2, 1/2), (1/2, −1/2). The matrices
 * are then expressed in the basis T(φ) = D(φ) W: D(φ) = diag(e^{−imφ}) turns k∥ onto the x axis,
 * and W pairs |m⟩ with |−m⟩ (columns (|m⟩ + i|−m⟩)/√2 in the pattern below). W is the square root
 * of the antiunitary symmetry Θ C2z (time reversal times the twofold rotation about [001], both
 * symmetries of every layer), which squares to +1, so in this basis A, C and −iB are real for any φ
 * (checked in test/valence/hamiltonian.test.ts). When the mirror through k∥ and [001] is a symmetry —
 * always in the axial approximation, along [100] and [110] otherwise — the matrices also split into
 * two blocks, components {0, 2, 5} and {1, 3, 4}: the "upper" and "lower" blocks of the unitary
 * transformation of D. A. Broido and L. J. Sham, Phys. Rev. B 31, 888 (1985) and of Chuang's
 * book (from memory), obtained here from the mirror, so also without the axial approximation.
 * Units: energies eV, k in 1/nm, ħ²/2m0 = HBAR2_OVER_2M0 eV nm².
 */
import { HBAR2_OVER_2M0 } from '../constants.js';

/** Valence models: 4 bands (heavy and light holes) or 6 (with the split-off band). */
export type ValenceModel = 'kp4' | 'kp6';

/** Material parameters of one point of the structure that the valence Hamiltonian needs. */
export interface ValencePoint {
  /** Strained heavy- and light-hole edges on the absolute scale (eV), including any field tilt. */
  readonly Ehh: number;
  readonly Elh: number;
  /** Luttinger parameters. */
  readonly gamma1: number;
  readonly gamma2: number;
  readonly gamma3: number;
  /** Spin–orbit splitting (eV); Infinity when unknown (custom materials): only kp4 is possible. */
  readonly Dso: number;
  /** Shear strain energy Q_ε = −b (ε∥ − ε⊥) (eV), Chuang's sign. */
  readonly Qe: number;
}

/** Band character of each basis component of the T(φ) basis: which band its pair belongs to. */
export type BandKind = 'hh' | 'lh' | 'so';
/** Components 0, 3 pair |3/2, ±3/2⟩; 1, 2 pair |3/2, ±1/2⟩; 4, 5 pair |1/2, ±1/2⟩. */
export const COMPONENT_BAND: readonly BandKind[] = ['hh', 'lh', 'lh', 'hh', 'so', 'so'];

/** The two blocks of the mirror-symmetric case, as component indices of the T(φ) basis. */
export function blocksOf(model: ValenceModel): readonly (readonly number[])[] {
  return model === 'kp4' ? [[0, 2], [1, 3]] : [[0, 2, 5], [1, 3, 4]];
}

export const bandCount = (model: ValenceModel): 4 | 6 => (model === 'kp4' ? 4 : 6);

/** Complex matrix, row-major. */
interface CMatrix {
  readonly rows: number;
  readonly cols: number;
  readonly re: Float64Array;
  readonly im: Float64Array;
}

const cmatrix = (rows: number, cols: number): CMatrix => ({ rows, cols, re: new Float64Array(rows * cols), im: new Float64Array(rows * cols) });

/** Q† X Q for a real 6×6 X and a complex 6×d Q. */
function congruence(X: Float64Array, Q: CMatrix): CMatrix {
  const d = Q.cols;
  const out = cmatrix(d, d);
  const tre = new Float64Array(6 * d);
  const tim = new Float64Array(6 * d);
  for (let i = 0; i < 6; i++) {
    for (let j = 0; j < d; j++) {
      let sr = 0;
      let si = 0;
      for (let k = 0; k < 6; k++) {
        const x = X[i * 6 + k]!;
        if (x === 0) continue;
        sr += x * Q.re[k * d + j]!;
        si += x * Q.im[k * d + j]!;
      }
      tre[i * d + j] = sr;
      tim[i * d + j] = si;
    }
  }
  for (let i = 0; i < d; i++) {
    for (let j = 0; j < d; j++) {
      let sr = 0;
      let si = 0;
      for (let k = 0; k < 6; k++) {
        // conj(Q[k][i]) * T[k][j]
        const ar = Q.re[k * d + i]!;
        const ai = -Q.im[k * d + i]!;
        const br = tre[k * d + j]!;
        const bi = tim[k * d + j]!;
        sr += ar * br - ai * bi;
        si += ar * bi + ai * br;
      }
      out.re[i * d + j] = sr;
      out.im[i * d + j] = si;
    }
  }
  return out;
}

const S2 = Math.SQRT2;
const S3 = Math.sqrt(3);
const S6 = Math.sqrt(6);

/**
 * |j, m⟩ in (X↑, Y↑, Z↑, X↓, Y↓, Z↓), column per state (Condon–Shortley: |1, ±1⟩ = ∓(X ± iY)/√2,
 * |1, 0⟩ = Z), as [re, im] pairs per row.
 */
const J_STATES: readonly (readonly (readonly [number, number])[])[] = [
  // (3/2, 3/2) = −(X + iY)↑/√2
  [[-1 / S2, 0], [0, -1 / S2], [0, 0], [0, 0], [0, 0], [0, 0]],
  // (3/2, 1/2) = [2Z↑ − (X + iY)↓]/√6
  [[0, 0], [0, 0], [2 / S6, 0], [-1 / S6, 0], [0, -1 / S6], [0, 0]],
  // (3/2, −1/2) = [(X − iY)↑ + 2Z↓]/√6
  [[1 / S6, 0], [0, -1 / S6], [0, 0], [0, 0], [0, 0], [2 / S6, 0]],
  // (3/2, −3/2) = (X − iY)↓/√2
  [[0, 0], [0, 0], [0, 0], [1 / S2, 0], [0, -1 / S2], [0, 0]],
  // (1/2, 1/2) = −[Z↑ + (X + iY)↓]/√3
  [[0, 0], [0, 0], [-1 / S3, 0], [-1 / S3, 0], [0, -1 / S3], [0, 0]],
  // (1/2, −1/2) = −[(X − iY)↑ − Z↓]/√3
  [[-1 / S3, 0], [0, 1 / S3], [0, 0], [0, 0], [0, 0], [1 / S3, 0]],
];
const M_J = [1.5, 0.5, -0.5, -1.5, 0.5, -0.5];
/** W: component c of the new basis as [(J index, coefficient re, im)]; (|m⟩ + i|−m⟩)/√2 pattern. */
const W_COLUMNS: readonly (readonly (readonly [number, number, number])[])[] = [
  [[0, 1 / S2, 0], [3, 0, 1 / S2]],
  [[1, 1 / S2, 0], [2, 0, 1 / S2]],
  [[1, 0, 1 / S2], [2, 1 / S2, 0]],
  [[0, 0, 1 / S2], [3, 1 / S2, 0]],
  [[4, 1 / S2, 0], [5, 0, -1 / S2]],
  [[4, 0, -1 / S2], [5, 1 / S2, 0]],
];

/** The 6×d map from (X, Y, Z) ⊗ spin to the T(φ) basis: columns U D(φ) W. */
function basisAt(d: number, phi: number): CMatrix {
  const Q = cmatrix(6, d);
  for (let c = 0; c < d; c++) {
    for (const [j, wr, wi] of W_COLUMNS[c]!) {
      // D(φ)_jj = e^{−i m_j φ}
      const dr = Math.cos(M_J[j]! * phi);
      const di = -Math.sin(M_J[j]! * phi);
      const cr = dr * wr - di * wi;
      const ci = dr * wi + di * wr;
      for (let r = 0; r < 6; r++) {
        const [ur, ui] = J_STATES[j]![r]!;
        Q.re[r * d + c] = Q.re[r * d + c]! + ur * cr - ui * ci;
        Q.im[r * d + c] = Q.im[r * d + c]! + ur * ci + ui * cr;
      }
    }
  }
  return Q;
}

/**
 * The T(φ) basis of `model` in the spinless-orbital ⊗ spin basis: row r = (X↑, Y↑, Z↑, X↓, Y↓, Z↓)
 * of the crystal axes, column c = basis component c (see the module comment), complex row-major
 * 6 × d. A state with components a_c in the T(φ) basis is Σ_c a_c · column c; its interband momentum
 * matrix element with |S, s⟩ along ê is P Σ_α ê_α (Σ_c Q_{(α,s),c} a_c), P = ⟨S|p_x|X⟩.
 */
export function blochBasis(model: ValenceModel, phi: number): { readonly cols: number; readonly re: Float64Array; readonly im: Float64Array } {
  const Q = basisAt(bandCount(model), phi);
  return { cols: Q.cols, re: Q.re, im: Q.im };
}

/** I2 ⊗ X for a 3×3 X given row-major: the spin-independent 6×6 matrix. */
function spinless(x: readonly number[]): Float64Array {
  const out = new Float64Array(36);
  for (let s = 0; s < 2; s++) for (let i = 0; i < 3; i++) for (let j = 0; j < 3; j++) out[(3 * s + i) * 6 + 3 * s + j] = x[3 * i + j]!;
  return out;
}

/**
 * Real coefficient matrices of one point in the T(φ) basis, d × d row-major (d = 4 or 6): the
 * operator at in-plane wave number k along φ is A0 + k² A2 + k(B kz + kz Bᵀ…) with B = i·B1·k
 * (B1 real) and C the kz·kz coefficient. Energies eV, lengths nm.
 */
export interface PointCoefficients {
  readonly d: number;
  readonly A0: Float64Array;
  readonly A2: Float64Array;
  readonly B1: Float64Array;
  readonly C: Float64Array;
}

/**
 * Coefficients of H at one point for in-plane direction φ (rad): see the module comment. With
 * `axial`, the in-plane anisotropic part uses γ̄ = (γ2 + γ3)/2 for both γ2 (k_x² − k_y²) and γ3
 * (k_x k_y) (the axial approximation of Chuang, PRB 43, 9649; from memory); the k_z terms keep γ2
 * and γ3. Returns real matrices (the imaginary parts vanish by the Θ C2z symmetry).
 */
export function pointCoefficients(p: ValencePoint, model: ValenceModel, phi: number, axial: boolean): PointCoefficients {
  const d = bandCount(model);
  const t = HBAR2_OVER_2M0;
  const { gamma1: g1, gamma2: g2, gamma3: g3 } = p;
  const L = -g1 - 4 * g2;
  const M = -g1 + 2 * g2;
  const Np = g1 - 2 * g2 - 6 * g3 + 1;
  const Nm = -g1 + 2 * g2 - 1;
  const c = Math.cos(phi);
  const s = Math.sin(phi);
  // In-plane quadratic form: ((L+M)/2) k² + ((L−M)/2)(kx² − ky²) σz + N kx ky σx on (X, Y).
  const gb = (g2 + g3) / 2;
  const half = axial ? -3 * gb : (L - M) / 2;
  const N = axial ? -6 * gb : Np + Nm;
  const sum = (L + M) / 2;
  const cos2 = c * c - s * s;
  const sincos = c * s;
  const a2 = [
    t * (sum + half * cos2), t * N * sincos, 0,
    t * N * sincos, t * (sum - half * cos2), 0,
    0, 0, t * M,
  ];
  const u = p.Ehh;
  const w = model === 'kp4' ? (3 * p.Elh - p.Ehh) / 2 : p.Ehh + 3 * p.Qe;
  const a0 = [u, 0, 0, 0, u, 0, 0, 0, w];
  const b1 = [0, 0, t * c * Np, 0, 0, t * s * Np, t * c * Nm, t * s * Nm, 0];
  const cc = [t * M, 0, 0, 0, t * M, 0, 0, 0, t * L];
  const Q = basisAt(d, phi);
  const A0 = congruence(spinless(a0), Q);
  if (model === 'kp6') for (const k of [4, 5]) A0.re[k * d + k] = A0.re[k * d + k]! - p.Dso;
  const A2 = congruence(spinless(a2), Q);
  const B = congruence(spinless(b1), Q);
  const C = congruence(spinless(cc), Q);
  return { d, A0: A0.re, A2: A2.re, B1: B.im, C: C.re };
}

/**
 * The bulk Hamiltonian at (k∥ along φ, k_z) as a real 2d × 2d matrix: H = A0 + k² A2 + k_z² C +
 * i k k_z (B1 − B1ᵀ) is complex Hermitian for k_z ≠ 0, so it is returned as the embedding
 * [[Re, −Im], [Im, Re]], whose eigenvalues are those of H, each twice. k, kz in 1/nm; result eV.
 */
export function bulkEmbedding(coef: PointCoefficients, k: number, kz: number): Float64Array {
  const d = coef.d;
  const n = 2 * d;
  const out = new Float64Array(n * n);
  for (let i = 0; i < d; i++) {
    for (let j = 0; j < d; j++) {
      const re = coef.A0[i * d + j]! + k * k * coef.A2[i * d + j]! + kz * kz * coef.C[i * d + j]!;
      // B = i k B1: B kz + kz B† = i k kz (B1 − B1ᵀ)
      const im = k * kz * (coef.B1[i * d + j]! - coef.B1[j * d + i]!);
      out[i * n + j] = re;
      out[(i + d) * n + j + d] = re;
      out[i * n + j + d] = -im;
      out[(i + d) * n + j] = im;
    }
  }
  return out;
}
