/**
 * Long runs never go silent: a command whose predicted work takes minutes says so before it starts,
 * a progress bar appears on a terminal once work has run past the delay (never for a quick one),
 * and sizes beyond the stated maxima are refused at once.
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { cli } from '../../engine/cli/app.js';
import { durationText, noteLongWork, progressBar } from '../../engine/cli/progress.js';
import { MAX_LAYERS } from '../../engine/structure.js';
import { spawnCli } from '../campaign/helpers.js';
import { captureStderr, onTerminal, withFastClock } from './terminal.js';

describe('runs that never go silent', () => {
  it('the progress bar draws on a terminal once the work passes the delay, and not for quick work', async () => {
    const slow = await onTerminal(async () => {
      const bar = progressBar('solve', 50);
      bar.update(1, 4, 'electron states');
      await new Promise((r) => setTimeout(r, 120));
      bar.update(2, 4, 'heavy_hole states');
      bar.stop();
    });
    expect(slow).toMatch(/solve \[.*\] 2\/4 .* heavy_hole states/);
    const quick = await onTerminal(() => { const bar = progressBar('solve', 50); bar.update(4, 4, 'done'); bar.stop(); });
    expect(quick).toBe('');
    // Drawn before anything is done (a long first task): no remaining time is guessed.
    const first = await onTerminal(async () => {
      const bar = progressBar('design', 20);
      await new Promise((r) => setTimeout(r, 60));
      bar.update(0, 8, 'start 1: 17 of up to 60 evaluations');
      bar.stop();
    });
    expect(first).toMatch(/design \[.*\] 0\/8 · \d+s · eta – · start 1: 17 of up to 60 evaluations/);
    expect(first).not.toMatch(/INF|NF/);
  });

  it('report --tolerance draws the bar of its Monte Carlo samples on a terminal once they run past the delay', async () => {
    const out = join(mkdtempSync(join(tmpdir(), 'ws-progress-')), 'r.html');
    let code = -1;
    // On a fast clock: 8000 samples can end within the real 2 s delay and draw nothing.
    const drawn = await withFastClock(() => onTerminal(async () => { code = (await cli(['report', 'runs/pump-976.yaml', '--tolerance', '--samples', '8000', '--workers', '1', '--out', out])).code; }));
    expect(code).toBe(0);
    expect(drawn).toMatch(/tolerance \[.*\] \d+\/\d+ .* sample batches/);
  }, 60_000);

  it('tolerance with stderr not a terminal logs time-stamped lines once it runs past the delay, the last one at the end', async () => {
    let code = -1;
    // On a fast clock: 8000 samples took 1.5 s on an idle machine and logged nothing.
    const logged = await withFastClock(() => captureStderr(async () => { code = (await cli(['tolerance', 'runs/pump-976.yaml', '--samples', '8000', '--workers', '1'])).code; }, false));
    expect(code).toBe(0);
    const lines = logged.trim().split('\n');
    expect(lines.length, logged).toBeGreaterThan(0);
    for (const l of lines) expect(l).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\dZ tolerance: \d+\/\d+ sample batches$/);
    const [done, total] = /(\d+)\/(\d+) sample batches$/.exec(lines.at(-1)!)!.slice(1).map(Number);
    expect(done).toBe(total);
  }, 60_000);

  it('a prediction above a minute is noted before the work, in words', async () => {
    expect(await onTerminal(() => noteLongWork('x', 59, 'why'))).toBe('');
    expect(await onTerminal(() => noteLongWork('this design', 7200, '10 starts'))).toBe('wellsmith: note: this design is predicted to take about 2.0 h (10 starts)\n');
    expect([durationText(42), durationText(600), durationText(9000)]).toEqual(['about 42 s', 'about 10 min', 'about 2.5 h']);
  });

  it('design announces hours of predicted work at once, before its first start finishes', async () => {
    let seen = '';
    const started = Date.now();
    const ended = await spawnCli(['design', 'runs/pump-976.yaml', '--starts', '100000', '--evaluations', '100000', '--workers', '1'], {
      onSpawn: (child) => child.stderr!.on('data', (d: Buffer) => { seen += d.toString(); if (/note:/.test(seen)) child.kill('SIGTERM'); }),
    });
    expect(ended.signal).toBe('SIGTERM');
    expect(seen).toMatch(/^wellsmith: note: this design is predicted to take about \d+(\.\d)? h \(100000 starts × up to 100000 evaluations at \S+ s each on 1 worker; fewer --starts or --evaluations take less\)$/m);
    expect(Date.now() - started, 'the note comes before the work').toBeLessThan(20_000);
  }, 30_000);

  it(`a stack beyond ${MAX_LAYERS} layers once its repeats are written out is refused at once, naming the limit`, async () => {
    const dir = mkdtempSync(join(tmpdir(), 'ws-progress-'));
    const f = join(dir, 'long.yaml');
    writeFileSync(f, 'stack:\n  - { repeat: [ { repeat: [ { material: Al0.3Ga0.7As, thickness: 1 nm }, { material: GaAs, thickness: 1 nm } ], periods: 3 } ], periods: 700 }\n');
    const started = Date.now();
    const o = await cli(['solve', f]);
    expect(o.code).toBe(2);
    expect(o.stderr).toMatch(new RegExp(`stack: 4200 layers once the repeats are written out, more than the ${MAX_LAYERS} a solve takes`));
    expect(Date.now() - started).toBeLessThan(2000);
  });
});
