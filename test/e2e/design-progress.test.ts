/**
 * A wire design shows its progress bar while this thread is busy: during its first start (run
 * synchronously on this thread, so no timer can fire) and during the ranking's full solves.
 */
import { describe, expect, it, vi } from 'vitest';
import { cli } from '../../engine/cli/app.js';
import { onTerminal } from './terminal.js';

/** How much faster than real time the clock runs here, so the bar's 2 s delay passes within the first start on any machine. */
const CLOCK_SPEED = 25;

describe('design progress on a terminal', () => {
  it('a wire design draws its bar from inside its first start and names the ranking solve', async () => {
    const real = Date.now.bind(Date);
    const t0 = real();
    const clock = vi.spyOn(Date, 'now').mockImplementation(() => t0 + (real() - t0) * CLOCK_SPEED);
    let code = -1;
    let drawn: string;
    try {
      // One start, so the only way to see a bar before the start finishes (0/1) is from its evaluations.
      drawn = await onTerminal(async () => { code = (await cli(['design', 'runs/wire-rect-gaas.yaml', '--starts', '1', '--top', '1', '--workers', '1', '--json'])).code; });
    } finally {
      clock.mockRestore();
    }
    expect(code).toBe(0);
    expect(drawn).toMatch(/design \[.*\] 0\/1 · .* · start 1: \d+ of up to 60 evaluations/);
    expect(drawn).toMatch(/design \[.*\] 1\/1 · .* · ranking: full solve of design 1 of 1 · best loss/);
  }, 60_000);
});
