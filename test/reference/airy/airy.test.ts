/**
 * engine/airy.ts against two reference libraries (fixture airy.json, generator airy_fixture.py
 * beside it): scipy.special.airy/airye, and mpmath at 50 digits, whose values also show scipy's own
 * error (about 6e-14 of the modulus). Errors are relative to the value (x ≥ 0, scaled forms) or to
 * the modulus |Ai| + |Bi| (x < 0, where the functions oscillate and pass through zero).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { AI0, AIP0, airyAt, airyTransfer, newAiryPoint, newAiryTransfer } from '../../../engine/airy.js';

interface Fixture {
  readonly scipy_vs_mpmath_max_relative: number;
  readonly values: readonly { x: number; scipy: number[]; mpmath: number[] }[];
  readonly transfers: readonly { x0: number; dx: number; log: number; entries: number[]; dtheta: number }[];
}
const fixture = JSON.parse(readFileSync(new URL('./airy.json', import.meta.url), 'utf8')) as Fixture;

const NAMES = ['Ai', "Ai'", 'Bi', "Bi'"];
/** Ours in the fixture's form: scaled by e^{±ζ} for every x ≥ 0 (ours scales only beyond 10, by s). */
const ours = (x: number): number[] => {
  const p = newAiryPoint();
  airyAt(x, p);
  const up = x >= 0 ? Math.exp((2 / 3) * x ** 1.5 - p.s) : 1;
  return [p.ai * up, p.aip * up, p.bi / up, p.bip / up];
};
const relative = (x: number, got: number[], want: number[], k: number): number =>
  Math.abs(got[k]! - want[k]!) / (x >= 0 ? Math.abs(want[k]!) : Math.abs(want[k & 1]!) + Math.abs(want[2 + (k & 1)]!));

describe('Airy functions', () => {
  it('Ai(0) and Ai′(0) are the closed forms 1/(3^(2/3) Γ(2/3)) and −1/(3^(1/3) Γ(1/3)) (DLMF 9.2.3–9.2.4)', () => {
    // Γ(1/3) = 2.678938534707747633, Γ(2/3) = 1.354117939426400417 (from memory; the fixture's x = 0 row checks the values too).
    expect(Math.abs(AI0 - 1 / (3 ** (2 / 3) * 1.354117939426400417))).toBeLessThan(2e-16);
    expect(Math.abs(AIP0 + 1 / (3 ** (1 / 3) * 2.678938534707747633))).toBeLessThan(2e-16);
  });

  it('scaled values match mpmath within 1e-14 and scipy within its own error (6e-14) plus ours, over [−60, 60]', () => {
    // |x| beyond 10 loses ε·ζ to the argument's own rounding (the phase is ζ); 60 has ζ = 310.
    let worstMp = 0;
    let worstSp = 0;
    for (const v of fixture.values) {
      const got = ours(v.x);
      const zeta = (2 / 3) * Math.abs(v.x) ** 1.5;
      const allow = 1e-14 + 4e-16 * zeta;
      for (let k = 0; k < 4; k++) {
        const eMp = relative(v.x, got, v.mpmath, k);
        const eSp = relative(v.x, got, v.scipy, k);
        worstMp = Math.max(worstMp, eMp / allow);
        worstSp = Math.max(worstSp, eSp);
        expect(eMp, `${NAMES[k]}(${v.x}): got ${got[k]}, mpmath ${v.mpmath[k]}, relative error ${eMp}, tolerance ${allow}`).toBeLessThan(allow);
        expect(eSp, `${NAMES[k]}(${v.x}): got ${got[k]}, scipy ${v.scipy[k]}, relative error ${eSp}, tolerance ${fixture.scipy_vs_mpmath_max_relative + allow}`).toBeLessThan(fixture.scipy_vs_mpmath_max_relative + allow);
      }
    }
    expect(worstMp).toBeLessThan(1);
    expect(worstSp).toBeGreaterThan(0);
  });

  it('the Wronskian Ai·Bi′ − Ai′·Bi is 1/π to 1e-14 wherever the pair is evaluated (DLMF 9.2.7)', () => {
    const p = newAiryPoint();
    for (let x = -40; x <= 40; x += 0.0371) {
      airyAt(x, p);
      const w = p.ai * p.bip - p.aip * p.bi;
      // The scales cancel: e^{s}·e^{−s}.
      const size = x < 0 ? (Math.abs(p.ai) + Math.abs(p.bi)) * (Math.abs(p.aip) + Math.abs(p.bip)) : Math.abs(p.ai * p.bip) + Math.abs(p.aip * p.bi);
      expect(Math.abs(w - 1 / Math.PI) / size, `x = ${x}: W = ${w}`).toBeLessThan(1e-14 * (1 + (2 / 3) * Math.abs(x) ** 1.5));
    }
  });

  it('the phase is continuous and increasing (up to its approach to π/2), π/3 at 0, Ai zero where it is π/2 mod π (DLMF 9.8, 9.9)', () => {
    const p = newAiryPoint();
    airyAt(0, p);
    expect(Math.abs(p.theta - Math.PI / 3)).toBeLessThan(1e-15);
    let last = -Infinity;
    for (let x = -30; x <= 30; x += 0.01) {
      airyAt(x, p);
      // Beyond x ≈ 8, π/2 − θ ≈ π Ai/Bi falls below the rounding of π/2.
      if (x < 8) expect(p.theta, `θ(${x})`).toBeGreaterThan(last);
      else expect(p.theta, `θ(${x})`).toBeGreaterThanOrEqual(last);
      if (last > -Infinity) expect(p.theta - last, `jump at ${x}`).toBeLessThan(0.06);
      last = p.theta;
    }
    // Ai vanishes where θ ≡ π/2 (mod π): its first zeros (DLMF table 9.9.1, from memory: −2.33810741, −4.08794944).
    const at = (x: number): number => { airyAt(x, p); return p.theta; };
    expect(Math.abs(at(-2.33810741045977) - (-Math.PI / 2))).toBeLessThan(1e-9);
    expect(Math.abs(at(-4.08794944413097) - (-3 * Math.PI / 2))).toBeLessThan(1e-9);
  });

  it('transfers match mpmath entries and phase changes, also far out where the phase is ~1e9 (weak fields)', () => {
    const t = newAiryTransfer();
    for (const f of fixture.transfers) {
      airyTransfer(f.x0, f.dx, t);
      const got = [t.uu, t.ud, t.du, t.dd].map((v) => v * Math.exp(t.gained - f.log));
      const size = Math.max(...f.entries.map(Math.abs));
      for (let k = 0; k < 4; k++) {
        const err = Math.abs(got[k]! - f.entries[k]!) / size;
        expect(err, `transfer ${f.x0} + ${f.dx}, entry ${k}: got ${got[k]}, mpmath ${f.entries[k]}, error ${err} of the largest entry`).toBeLessThan(1e-12);
      }
      const dErr = Math.abs(t.dtheta - f.dtheta);
      expect(dErr, `transfer ${f.x0} + ${f.dx}: dtheta ${t.dtheta}, mpmath ${f.dtheta}`).toBeLessThan(1e-12 * Math.max(1, Math.abs(f.dtheta)));
    }
  });
});
