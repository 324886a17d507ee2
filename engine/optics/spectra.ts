/**
 * Optical spectra of a well at an injected density: material gain (TE, TM), absorption of the
 * unpumped well, spontaneous emission and the radiative current, by Fermi's golden rule.
 *
 * Gain (S. L. Chuang, Physics of Optoelectronic Devices, Wiley 1995, Ch. 9; L. A. Coldren and
 * S. W. Corzine, Diode Lasers and Photonic Integrated Circuits, Wiley 1995, Ch. 4; from memory):
 *   g(ħω) = (π e² ħ / (n_r c ε0 m0² ħω L_w)) Σ_pairs ∫ d²k/(2π)² |ê·p_cv(k)|² (f_c − f_v) L(E_cv(k) − ħω),
 * summed over both valence branches and the conduction spin (inside the factors, momentum.ts), with
 * |ê·p|² = (m0/6)·factor, f_c and f_v the Fermi functions of the conduction and valence states at the
 * quasi-Fermi levels, L the lineshape (lineshape.ts) and L_w the well thickness (material gain).
 * Absorption of the unpumped well: f_c = 0, f_v = 1, α = −g. Spontaneous emission per unit area,
 * photon energy and time (both polarisations, all directions): r_sp(ħω) = (n_r² (ħω)²/(π² ħ³ c²))
 * g_sp(ħω) L_w, g_sp as g with f_c(1 − f_v) and the direction-averaged factor (2 TE + TM)/3 (the
 * Einstein relation: emission into each of the n_r³(ħω)²/(π² ħ³ c³) photon modes per volume and
 * energy at the stimulated rate (c/n_r) g_sp; Coldren and Corzine Ch. 4, from memory); radiative
 * current J = e ∫ r_sp d(ħω), taken over the unbroadened transitions (a lineshape of unit area moves
 * no emission), with the photon energy at the transition energy.
 *
 * Integration (ours): the tables of bands.ts are linear in u = k² between grid points (exact for
 * parabolic bands); each k interval is cut into pieces over which E_c and E_v move by at most
 * `occupationStep_eV`; over a piece the weight factor·occupation is taken linear in u between its
 * values at the two ends (the trapezoid rule, second order) and spread with that profile over the
 * transition energies the piece spans, into bins around the photon range (geometrically wider bins
 * outside it). The spectrum at ħω is then Σ_bins H_b ⟨L⟩_b, with the lineshape averaged over each bin
 * exactly through its cumulative Φ. The bin sums do not depend on the lineshape and the bin kernel
 * not on the density: a spectrum at several densities reuses both. Checked against the closed-form
 * staircase (1.5e-6 of the absorption) and a scipy quadrature over k (2e-4 with broadening, from the
 * Γ/8 bins): test/reference/optics/.
 * Units: eV, nm, cm⁻¹, K; densities cm⁻².
 */
import { ELEMENTARY_CHARGE_C, ELECTRON_MASS_KG, EPSILON0_F_PER_M, HBAR_EV_S, HC_EV_NM, KB_EV_PER_K } from '../constants.js';
import { InputError } from '../errors.js';
import { electronFermiLevelForDensity, holeFermiLevelForDensity } from '../observables/carriers.js';
import type { OpticalBands } from './bands.js';
import type { Lineshape } from './lineshape.js';
import type { Population } from './schema.js';

/** Speed of light (m/s), from hc and ħ of the constants module (exact in SI). */
const C_M_PER_S = (HC_EV_NM * 1e-9) / (2 * Math.PI * HBAR_EV_S);
const HBAR_J_S = HBAR_EV_S * ELEMENTARY_CHARGE_C;
/**
 * g[cm⁻¹] = GAIN_UNIT · S/(n_r L_w[nm]) with S = Σ ∫ d²k/(4π²) (factor/ħω) F L in nm⁻² eV⁻¹:
 * π e² ħ/(6 c ε0 m0) in J m², times 1 nm⁻² eV⁻¹ = 1e18/e m⁻² J⁻¹, over 1 nm, in cm⁻¹.
 */
export const GAIN_UNIT = ((Math.PI * ELEMENTARY_CHARGE_C ** 2 * HBAR_J_S) / (6 * C_M_PER_S * EPSILON0_F_PER_M * ELECTRON_MASS_KG)) * (1e18 / ELEMENTARY_CHARGE_C) / 1e-9 / 100;

export interface SpectrumOptions {
  /** Photon energies (eV), ascending. */
  readonly photon_eV: Float64Array;
  readonly lineshape: Lineshape;
  /** Background refractive index of the well. */
  readonly refractiveIndex: number;
  /**
   * Target bin width (eV) around the photon range; default min(1 meV, Γ/8), 0.25 meV without
   * broadening. On a uniform photon grid the bins are the grid step over the smallest whole number
   * that makes them no wider than this.
   */
  readonly bin_eV?: number;
  /** Largest move of E_c or E_v within one integration piece (eV); default kT/8. */
  readonly occupationStep_eV?: number;
}

/** Quasi-Fermi levels (eV, absolute) of a population; ±Infinity for an empty band. */
export interface Levels {
  readonly electron_eV: number;
  readonly hole_eV: number;
}

/** Bin sums of one population: ∫ over each bin of the TE and TM gain weights and the spontaneous-emission weight (eV nm⁻²: factor × states per area). */
export interface BinSums {
  readonly levels: Levels;
  readonly te: Float64Array;
  readonly tm: Float64Array;
  readonly spontaneous: Float64Array;
}

export interface Spectrum {
  readonly population: Population;
  readonly levels: Levels;
  /** Rigid shift of every transition (eV; band-gap renormalisation, 0 when off). */
  readonly shift_eV: number;
  /** Material gain (cm⁻¹) at each photon energy; negative is absorption. */
  readonly gain_te_per_cm: Float64Array;
  readonly gain_tm_per_cm: Float64Array;
  /** Spontaneous emission per unit area of the well, per photon energy and time (cm⁻² s⁻¹ eV⁻¹). */
  readonly spontaneous_per_cm2_s_eV: Float64Array;
  /** Radiative current density (A/cm²). */
  readonly radiativeCurrent_A_per_cm2: number;
}

/**
 * Pieces of the k integration, consecutive along each pair's k grid, with their values at both ends
 * (binSums reads the start values only where a pair begins: elsewhere a start is the previous end).
 */
interface Pieces {
  readonly count: number;
  /** The piece opens a new pair: its start values are in the *0 arrays. */
  readonly starts: Uint8Array;
  /** Transition energy, conduction and valence energies at the piece's start and end. */
  readonly e0: Float64Array;
  readonly e1: Float64Array;
  readonly ec0: Float64Array;
  readonly ec1: Float64Array;
  readonly ev0: Float64Array;
  readonly ev1: Float64Array;
  /** TE and TM factors (eV) at the start and end. */
  readonly te0: Float64Array;
  readonly te1: Float64Array;
  readonly tm0: Float64Array;
  readonly tm1: Float64Array;
  /** w_dir Δu/(4π) of the piece (nm⁻²). */
  readonly weight: Float64Array;
}

/** A pair whose factors stay below this share of the largest anywhere adds nothing visible (a forbidden line). */
const NEGLIGIBLE_PAIR = 1e-7;

/**
 * The integration pieces (module comment). Intervals whose transition energies lie outside
 * [lo, hi] (beyond the photon range and the lineshape's reach) are not cut: only their sum enters
 * there, through the smooth tail of the lineshape.
 */
function piecesOf(bands: OpticalBands, step: number, lo: number, hi: number): Pieces {
  const k = bands.k_per_nm;
  const nk = k.length;
  let largest = 0;
  for (const dir of bands.directions) for (const p of dir.pairs) for (let i = 0; i < nk; i++) largest = Math.max(largest, p.te[i]! + p.tm[i]!);
  const cuts: number[] = [];
  const used: { weight: number; p: OpticalBands['directions'][number]['pairs'][number] }[] = [];
  let count = 0;
  for (const dir of bands.directions) {
    for (const p of dir.pairs) {
      let top = 0;
      for (let i = 0; i < nk; i++) top = Math.max(top, p.te[i]! + p.tm[i]!);
      if (!(top > NEGLIGIBLE_PAIR * largest)) continue;
      used.push({ weight: dir.weight, p });
      for (let i = 0; i + 1 < nk; i++) {
        const ea = p.Ec[i]! - p.Ev[i]!;
        const eb = p.Ec[i + 1]! - p.Ev[i + 1]!;
        const inside = Math.max(ea, eb) >= lo && Math.min(ea, eb) <= hi;
        const n = inside ? Math.max(1, Math.ceil(Math.max(Math.abs(p.Ec[i + 1]! - p.Ec[i]!), Math.abs(p.Ev[i + 1]! - p.Ev[i]!)) / step)) : 1;
        cuts.push(n);
        count += n;
      }
    }
  }
  const f64 = (): Float64Array => new Float64Array(count);
  const P = { count, starts: new Uint8Array(count), e0: f64(), e1: f64(), ec0: f64(), ec1: f64(), ev0: f64(), ev1: f64(), te0: f64(), te1: f64(), tm0: f64(), tm1: f64(), weight: f64() };
  let s = 0;
  let c = 0;
  for (const { weight, p } of used) {
    for (let i = 0; i + 1 < nk; i++) {
      const n = cuts[c++]!;
      const ua = k[i]! * k[i]!;
      const w = (weight * (k[i + 1]! * k[i + 1]! - ua)) / n / (4 * Math.PI);
      const lin = (a: Float64Array, t: number): number => a[i]! + t * (a[i + 1]! - a[i]!);
      for (let j = 0; j < n; j++, s++) {
        const t0 = j / n;
        const t1 = (j + 1) / n;
        P.starts[s] = i === 0 && j === 0 ? 1 : 0;
        P.ec0[s] = lin(p.Ec, t0);
        P.ev0[s] = lin(p.Ev, t0);
        P.ec1[s] = lin(p.Ec, t1);
        P.ev1[s] = lin(p.Ev, t1);
        P.e0[s] = P.ec0[s]! - P.ev0[s]!;
        P.e1[s] = P.ec1[s]! - P.ev1[s]!;
        P.te0[s] = lin(p.te, t0);
        P.te1[s] = lin(p.te, t1);
        P.tm0[s] = lin(p.tm, t0);
        P.tm1[s] = lin(p.tm, t1);
        P.weight[s] = w;
      }
    }
  }
  return P;
}

/**
 * Bin edges: `core` bins of width `bin` from lo, then geometric (×1.25) outwards to cover [min, max].
 * Returns the edges and the index of the first core edge.
 */
function binEdges(lo: number, core: number, bin: number, min: number, max: number): { readonly edges: Float64Array; readonly coreStart: number } {
  const below: number[] = [];
  let w = bin;
  for (let e = lo; e > min; ) {
    w *= 1.25;
    e -= w;
    below.push(e);
  }
  const edges = below.reverse();
  const coreStart = edges.length;
  for (let j = 0; j <= core; j++) edges.push(lo + j * bin);
  w = bin;
  for (let e = lo + core * bin; e < max; ) {
    w *= 1.25;
    e += w;
    edges.push(e);
  }
  return { edges: Float64Array.from(edges), coreStart };
}

/** Fermi function 1/(1 + e^x), finite for every x. */
const fermi = (x: number): number => (x > 0 ? Math.exp(-x) / (1 + Math.exp(-x)) : 1 / (1 + Math.exp(x)));

/**
 * A spectrum calculator for one set of optical bands, photon grid and lineshape: the integration
 * pieces, bins and kernel are built once; `at` evaluates a population. See the module comment.
 */
export class SpectrumEngine {
  readonly photon_eV: Float64Array;
  readonly lineshape: Lineshape;
  readonly refractiveIndex: number;
  readonly edges: Float64Array;
  private readonly pieces: Pieces;
  /** The bin holding the lower end of each piece's transition energies. */
  private readonly firstBin: Int32Array;
  private readonly kernels = new Map<number, Kernel>();
  private readonly kT: number;
  /** Bins per photon step on a uniform grid (0 otherwise), and the uniform core of the bins. */
  private readonly perStep: number;
  private readonly core: { readonly start: number; readonly count: number; readonly lead: number; readonly bin: number };

  constructor(readonly bands: OpticalBands, options: SpectrumOptions) {
    const w = options.photon_eV;
    if (w.length < 1 || !w.every((x, i) => Number.isFinite(x) && x > 0 && (i === 0 || x > w[i - 1]!))) {
      throw new InputError('bad-value', 'optics.photon_energies: must be positive and ascending (eV)', 'optics.photon_energies');
    }
    if (!(options.refractiveIndex > 0)) throw new InputError('bad-value', `optics.refractive_index: must be positive, got ${options.refractiveIndex}`, 'optics.refractive_index');
    if (!(bands.temperature_K > 0)) throw new InputError('bad-value', `temperature: optical spectra need T > 0 (Fermi statistics), got ${bands.temperature_K} K; give e.g. 4 K`, 'temperature');
    this.photon_eV = w;
    this.lineshape = options.lineshape;
    this.refractiveIndex = options.refractiveIndex;
    this.kT = KB_EV_PER_K * bands.temperature_K;
    const g = options.lineshape.gamma_eV;
    const target = options.bin_eV ?? (g > 0 ? Math.min(1e-3, g / 8) : 2.5e-4);
    // On a uniform photon grid of step Δ the bins are Δ/m wide and aligned with it, so every
    // (core edge − photon energy) lies on one lattice and the kernel needs one Φ per lattice point.
    const step = w.length > 1 ? (w[w.length - 1]! - w[0]!) / (w.length - 1) : 0;
    const uniform = w.length > 1 && w.every((x, i) => Math.abs(x - (w[0]! + i * step)) <= 1e-9 * step);
    this.perStep = uniform ? Math.max(1, Math.ceil(step / target - 1e-9)) : 0;
    const bin = uniform ? step / this.perStep : target;
    // The core reaches past the photon range by the lineshape's width and room for a renormalised
    // gap (tens of meV); beyond it the kernel is smooth and coarse bins suffice.
    const margin = Math.max(30 * g, 0.06);
    this.pieces = piecesOf(bands, options.occupationStep_eV ?? this.kT / 8, w[0]! - margin, w[w.length - 1]! + margin);
    let min = Infinity;
    let max = -Infinity;
    for (let s = 0; s < this.pieces.count; s++) {
      min = Math.min(min, this.pieces.e0[s]!, this.pieces.e1[s]!);
      max = Math.max(max, this.pieces.e0[s]!, this.pieces.e1[s]!);
    }
    const lead = Math.ceil(Math.min(margin, Math.max(w[0]! - min, 0) + bin) / bin);
    const lo = w[0]! - lead * bin;
    const core = lead + Math.ceil((w[w.length - 1]! - w[0]! + margin) / bin);
    const b = binEdges(lo, core, bin, min - 0.2, max);
    this.edges = b.edges;
    this.core = { start: b.coreStart, count: core, lead, bin };
    const e = this.edges;
    const nb = e.length - 1;
    this.firstBin = new Int32Array(this.pieces.count);
    // Binary search per piece: bins are not uniform outside the core.
    const locate = (x: number): number => {
      let a = 0;
      let b = nb - 1;
      if (x <= e[0]!) return 0;
      if (x >= e[nb]!) return nb - 1;
      while (a < b) {
        const m = (a + b + 1) >> 1;
        if (e[m]! <= x) a = m;
        else b = m - 1;
      }
      return a;
    };
    for (let s = 0; s < this.pieces.count; s++) this.firstBin[s] = locate(Math.min(this.pieces.e0[s]!, this.pieces.e1[s]!));
  }

  /** Quasi-Fermi levels of a population from the tabulated dispersions (carriers.ts). */
  levels(p: Population): Levels {
    if (!(p.electrons_cm2 >= 0) || !(p.holes_cm2 >= 0) || !Number.isFinite(p.electrons_cm2 + p.holes_cm2)) {
      throw new InputError('bad-value', `optics.densities: sheet densities must be finite and ≥ 0, got n = ${p.electrons_cm2}, p = ${p.holes_cm2} cm⁻²`, 'optics.densities');
    }
    const T = this.bands.temperature_K;
    return {
      electron_eV: p.electrons_cm2 > 0 ? electronFermiLevelForDensity({ dispersion: this.bands.electrons, density_cm2: p.electrons_cm2, temperature_K: T }) : -Infinity,
      hole_eV: p.holes_cm2 > 0 ? holeFermiLevelForDensity({ dispersion: this.bands.holes, density_cm2: p.holes_cm2, temperature_K: T }) : Infinity,
    };
  }

  /**
   * Bin sums at given quasi-Fermi levels (eV; −∞/+∞ for empty bands, as `levels` gives): each
   * piece's weight, linear in u between its ends (the trapezoid rule, second order in the piece),
   * spread over the transition energies it spans with that linear profile.
   */
  binSums(levels: Levels): BinSums {
    const nb = this.edges.length - 1;
    const e = this.edges;
    const te = new Float64Array(nb);
    const tm = new Float64Array(nb);
    const sp = new Float64Array(nb);
    const P = this.pieces;
    const kT = this.kT;
    const Fc = levels.electron_eV;
    const Fv = levels.hole_eV;
    let fc0 = 0;
    let fv0 = 0;
    for (let s = 0; s < P.count; s++) {
      if (P.starts[s]) {
        fc0 = fermi((P.ec0[s]! - Fc) / kT);
        fv0 = fermi((P.ev0[s]! - Fv) / kT);
      }
      const fc1 = fermi((P.ec1[s]! - Fc) / kT);
      const fv1 = fermi((P.ev1[s]! - Fv) / kT);
      const W = P.weight[s]!;
      // Weights per unit u at the two ends.
      const te0 = P.te0[s]! * (fc0 - fv0);
      const te1 = P.te1[s]! * (fc1 - fv1);
      const tm0 = P.tm0[s]! * (fc0 - fv0);
      const tm1 = P.tm1[s]! * (fc1 - fv1);
      const sp0 = ((2 * P.te0[s]! + P.tm0[s]!) / 3) * fc0 * (1 - fv0);
      const sp1 = ((2 * P.te1[s]! + P.tm1[s]!) / 3) * fc1 * (1 - fv1);
      fc0 = fc1;
      fv0 = fv1;
      const a = P.e0[s]!;
      const b = P.e1[s]!;
      const lo = Math.min(a, b);
      const hi = Math.max(a, b);
      let j = this.firstBin[s]!;
      if (!(hi - lo > 1e-12) || hi <= e[j + 1]!) {
        te[j] = te[j]! + 0.5 * W * (te0 + te1);
        tm[j] = tm[j]! + 0.5 * W * (tm0 + tm1);
        sp[j] = sp[j]! + 0.5 * W * (sp0 + sp1);
        continue;
      }
      // Bin share: ∫ over the overlap of the linear weight, i.e. the overlap's length times the weight at its middle.
      const inv = 1 / (b - a);
      const span = 1 / (hi - lo);
      for (; j < nb && e[j]! < hi; j++) {
        const x0 = Math.max(lo, e[j]!);
        const x1 = Math.min(hi, e[j + 1]!);
        if (!(x1 > x0)) continue;
        const f = W * (x1 - x0) * span;
        const t = (0.5 * (x0 + x1) - a) * inv;
        te[j] = te[j]! + f * (te0 + t * (te1 - te0));
        tm[j] = tm[j]! + f * (tm0 + t * (tm1 - tm0));
        sp[j] = sp[j]! + f * (sp0 + t * (sp1 - sp0));
      }
    }
    return { levels, te, tm, spontaneous: sp };
  }

  /**
   * The bin kernel ⟨L(E − ħω')⟩_b for ω' = ω − shift (cached per shift): on a uniform photon grid,
   * the core bins' values as one lattice D (photon j, core bin c → D[c + m(n − 1 − j)]) and the
   * other bins as a dense table; otherwise a dense table of every bin.
   */
  private kernel(shift: number): Kernel {
    let K = this.kernels.get(shift);
    if (K) return K;
    const w = this.photon_eV;
    const e = this.edges;
    const nb = e.length - 1;
    const cdf = this.lineshape.cumulative;
    const { start, count, lead, bin } = this.core;
    const m = this.perStep;
    const dense = (bins: readonly number[]): Float64Array => {
      const out = new Float64Array(w.length * bins.length);
      for (let j = 0; j < w.length; j++) {
        const x = w[j]! - shift;
        bins.forEach((b, q) => { out[j * bins.length + q] = (cdf(e[b + 1]! - x) - cdf(e[b]! - x)) / (e[b + 1]! - e[b]!); });
      }
      return out;
    };
    if (m > 0) {
      // Core edge start + c minus photon j plus the shift: (c − lead − m j)·bin + shift.
      const span = count + m * (w.length - 1);
      const phi = new Float64Array(span + 1);
      for (let i = 0; i <= span; i++) phi[i] = cdf((i - lead - m * (w.length - 1)) * bin + shift);
      const lattice = new Float64Array(span);
      let first = span;
      let last = -1;
      for (let i = 0; i < span; i++) {
        lattice[i] = (phi[i + 1]! - phi[i]!) / bin;
        if (lattice[i] !== 0) { first = Math.min(first, i); last = i; }
      }
      const outer = Array.from({ length: nb }, (_, b) => b).filter((b) => b < start || b >= start + count);
      K = { lattice, support: [first, last], outer, outerTable: dense(outer) };
    } else {
      const all = Array.from({ length: nb }, (_, b) => b);
      K = { lattice: null, support: [0, -1], outer: all, outerTable: dense(all) };
    }
    if (this.kernels.size > 8) this.kernels.clear();
    this.kernels.set(shift, K);
    return K;
  }

  /**
   * Σ_b H_b ⟨L⟩_b at every photon energy for several bin-sum arrays at once (one pass over the
   * kernel), divided by ħω: the spectra before their constant prefactors.
   */
  private convolve(hs: readonly Float64Array[], shift: number): Float64Array[] {
    const K = this.kernel(shift);
    const w = this.photon_eV;
    const n = w.length;
    const out = hs.map(() => new Float64Array(n));
    const { start, count } = this.core;
    const m = this.perStep;
    const no = K.outer.length;
    // Core bins that hold anything: a spectrum starts at its lowest transition, far inside the range.
    const held = hs.map((h) => {
      let a = start + count;
      let b = start - 1;
      for (let i = start; i < start + count; i++) if (h[i] !== 0) { a = Math.min(a, i); b = i; }
      return [a, b] as const;
    });
    for (let j = 0; j < n; j++) {
      const off = m * (n - 1 - j) - start;
      for (let q = 0; q < hs.length; q++) {
        const h = hs[q]!;
        let s = 0;
        if (K.lattice) {
          const L = K.lattice;
          // Bins where both the sums and the kernel (exactly 0 beyond a sech's ±40Γ) are non-zero.
          const from = Math.max(held[q]![0], K.support[0] - off);
          const to = Math.min(held[q]![1], K.support[1] - off);
          for (let b = from; b <= to; b++) s += h[b]! * L[b + off]!;
        }
        const row = j * no;
        for (let r = 0; r < no; r++) s += h[K.outer[r]!]! * K.outerTable[row + r]!;
        out[q]![j] = s / w[j]!;
      }
    }
    return out;
  }

  /** Material gain (cm⁻¹) from bin sums at each photon energy of the grid; `which` picks TE or TM. */
  gainOn(sums: BinSums, which: 'te' | 'tm', shift = 0): Float64Array {
    const unit = GAIN_UNIT / (this.refractiveIndex * this.bands.well_nm);
    return this.convolve([sums[which]], shift)[0]!.map((v) => unit * v);
  }

  /** Material gain (cm⁻¹) at one photon energy (eV), for refining a peak between grid points. */
  gainAt(sums: BinSums, which: 'te' | 'tm', photon_eV: number, shift = 0): number {
    const e = this.edges;
    const h = sums[which];
    const cdf = this.lineshape.cumulative;
    const x = photon_eV - shift;
    let s = 0;
    let prev = cdf(e[0]! - x);
    for (let b = 0; b < h.length; b++) {
      const next = cdf(e[b + 1]! - x);
      if (h[b] !== 0) s += ((next - prev) / (e[b + 1]! - e[b]!)) * h[b]!;
      prev = next;
    }
    return (GAIN_UNIT * s) / (this.refractiveIndex * this.bands.well_nm * photon_eV);
  }

  /** Spontaneous emission per unit area per photon energy and time (cm⁻² s⁻¹ eV⁻¹) from g_sp/ħω-less sums; see the module comment. */
  private emissionFactor(): number {
    const n = this.refractiveIndex;
    // r_sp = n² E²/(π² ħ³ c²) g_sp L_w: E in J (×e), g in m⁻¹ (×100 from cm⁻¹), L_w in m; per m² s J → ×1e-4 per cm², ×e per eV.
    return ((n * n) / (Math.PI ** 2 * HBAR_J_S ** 3 * C_M_PER_S ** 2)) * ELEMENTARY_CHARGE_C ** 2 * (this.bands.well_nm * 1e-9) * 100 * 1e-4 * ELEMENTARY_CHARGE_C;
  }

  /** Radiative current (A/cm²): e ∫ r_sp d(ħω) over the unbroadened bin sums, ħω at each bin's transition energy. */
  radiativeCurrent(sums: BinSums, shift = 0): number {
    const unit = GAIN_UNIT / (this.refractiveIndex * this.bands.well_nm);
    const e = this.edges;
    let rate = 0;
    for (let b = 0; b < sums.spontaneous.length; b++) rate += (0.5 * (e[b]! + e[b + 1]!) + shift) * sums.spontaneous[b]!;
    return ELEMENTARY_CHARGE_C * this.emissionFactor() * unit * rate;
  }

  /** The full spectrum of a population, with a rigid transition shift (eV) for band-gap renormalisation. */
  at(p: Population, shift_eV = 0): Spectrum {
    return this.fromSums(p, this.binSums(this.levels(p)), shift_eV);
  }

  /** The spectrum of a population from its bin sums (binSums of its levels). */
  fromSums(p: Population, sums: BinSums, shift_eV = 0): Spectrum {
    const levels = sums.levels;
    const [te, tm, sp] = this.convolve([sums.te, sums.tm, sums.spontaneous], shift_eV) as [Float64Array, Float64Array, Float64Array];
    const unit = GAIN_UNIT / (this.refractiveIndex * this.bands.well_nm);
    const emission = this.emissionFactor() * unit;
    const w = this.photon_eV;
    return {
      population: p, levels, shift_eV,
      gain_te_per_cm: te.map((v) => unit * v),
      gain_tm_per_cm: tm.map((v) => unit * v),
      // g_sp(ħω)·(ħω)² with g_sp = unit·conv/ħω.
      spontaneous_per_cm2_s_eV: sp.map((v, j) => emission * v * w[j]! * w[j]!),
      radiativeCurrent_A_per_cm2: this.radiativeCurrent(sums, shift_eV),
    };
  }
}

/** The bin kernel of one shift (SpectrumEngine.kernel). */
interface Kernel {
  readonly lattice: Float64Array | null;
  /** First and last non-zero lattice index. */
  readonly support: readonly [number, number];
  readonly outer: readonly number[];
  readonly outerTable: Float64Array;
}
