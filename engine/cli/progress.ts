/** A progress bar on stderr, only when stderr is a terminal; stdout stays for results. */
import { createRequire } from 'node:module';
import type cliProgressModule from 'cli-progress';

// Loaded only for a terminal: piped and CI runs never pay its start-up time.
const load = (): typeof cliProgressModule => createRequire(import.meta.url)('cli-progress') as typeof cliProgressModule;

export interface Progress {
  readonly update: (done: number, total: number, note: string) => void;
  readonly stop: () => void;
}

export function progressBar(label: string): Progress {
  if (!process.stderr.isTTY) return { update: () => undefined, stop: () => undefined };
  const cliProgress = load();
  const bar = new cliProgress.SingleBar({
    stream: process.stderr,
    format: `${label} [{bar}] {value}/{total} · eta {eta_formatted} · {note}`,
    hideCursor: true,
    clearOnComplete: true,
  }, cliProgress.Presets.shades_classic);
  let started = false;
  return {
    update: (done, total, note) => {
      if (!started) { bar.start(total, 0, { note }); started = true; }
      bar.update(done, { note });
    },
    stop: () => { if (started) bar.stop(); },
  };
}
