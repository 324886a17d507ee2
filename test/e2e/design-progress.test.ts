/**
 * A wire design shows its progress bar while this thread is busy: during its first start (run
 * synchronously on this thread, so no timer can fire) and during the ranking's full solves.
 */
import { describe, expect, it } from 'vitest';
import { cli } from '../../engine/cli/app.js';
import { onTerminal, withFastClock } from './terminal.js';

describe('design progress on a terminal', () => {
  it('a wire design draws its bar from inside its first start and names the ranking solve', async () => {
    let code = -1;
    // A fast clock, so the bar's 2 s delay passes within the first start on any machine; one start,
    // so the only way to see a bar before the start finishes (0/1) is from its evaluations.
    const drawn = await withFastClock(() => onTerminal(async () => { code = (await cli(['design', 'runs/wire-rect-gaas.yaml', '--starts', '1', '--top', '1', '--workers', '1', '--json'])).code; }));
    expect(code).toBe(0);
    expect(drawn).toMatch(/design \[.*\] 0\/1 · .* · start 1: \d+ of up to 60 evaluations/);
    expect(drawn).toMatch(/design \[.*\] 1\/1 · .* · ranking: full solve of design 1 of 1 · best loss/);
  }, 60_000);
});
