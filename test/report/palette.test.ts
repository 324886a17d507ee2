import { describe, expect, it } from 'vitest';
import { PALETTE } from '../../engine/report/palette.js';

// Dichromat simulation matrices in linear RGB, severity 1.0: G. M. Machado, M. M. Oliveira and
// L. A. F. Fernandes, IEEE TVCG 15, 1291 (2009) (from memory). sRGB transfer curve, D65 XYZ and
// CIE 1976 L*a*b* are common practice.
const DEUTERANOPIA = [[0.367322, 0.860646, -0.227968], [0.280085, 0.672501, 0.047413], [-0.01182, 0.04294, 0.968881]];
const PROTANOPIA = [[0.152286, 1.052583, -0.204868], [0.114503, 0.786281, 0.099216], [-0.003882, -0.048116, 1.051998]];

const linear = (hex: string): number[] => [1, 3, 5].map((i) => {
  const c = parseInt(hex.slice(i, i + 2), 16) / 255;
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
});
const lab = (rgb: number[]): number[] => {
  const [r, g, b] = rgb.map((v) => Math.min(1, Math.max(0, v))) as [number, number, number];
  const f = (t: number): number => (t > 216 / 24389 ? Math.cbrt(t) : (24389 / 27 * t + 16) / 116);
  const X = (0.4124 * r + 0.3576 * g + 0.1805 * b) / 0.95047;
  const Y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  const Z = (0.0193 * r + 0.1192 * g + 0.9505 * b) / 1.08883;
  return [116 * f(Y) - 16, 500 * (f(X) - f(Y)), 200 * (f(Y) - f(Z))];
};
const simulate = (hex: string, m: number[][] | null): number[] => {
  const l = linear(hex);
  return m ? m.map((row) => row[0]! * l[0]! + row[1]! * l[1]! + row[2]! * l[2]!) : l;
};

describe('palette', () => {
  // ΔE*ab ≥ 20 is a clearly distinguishable pair for lines (common practice: ≈ 2.3 is a just-noticeable difference).
  it.each([['normal vision', null], ['deuteranopia', DEUTERANOPIA], ['protanopia', PROTANOPIA]] as const)('keeps every pair apart under %s', (_name, m) => {
    const entries = Object.entries(PALETTE);
    for (const [i, [a, ha]] of entries.entries()) {
      for (const [b, hb] of entries.slice(i + 1)) {
        const [p, q] = [lab(simulate(ha, m as number[][] | null)), lab(simulate(hb, m as number[][] | null))];
        const d = Math.hypot(p[0]! - q[0]!, p[1]! - q[1]!, p[2]! - q[2]!);
        expect(d, `${a} ${ha} vs ${b} ${hb}: ΔE = ${d.toFixed(1)}, expected ≥ 20`).toBeGreaterThanOrEqual(20);
      }
    }
  });
});
