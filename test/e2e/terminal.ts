import { vi } from 'vitest';

/** Runs f with stderr taken for a terminal (isTTY) or a pipe and returns what it wrote there. */
export async function captureStderr(f: () => Promise<void> | void, isTTY: boolean): Promise<string> {
  const chunks: string[] = [];
  const write = process.stderr.write.bind(process.stderr);
  const was = process.stderr.isTTY;
  process.stderr.isTTY = isTTY;
  process.stderr.write = ((c: string | Uint8Array) => { chunks.push(String(c)); return true; }) as typeof process.stderr.write;
  try {
    await f();
  } finally {
    process.stderr.write = write;
    process.stderr.isTTY = was;
  }
  return chunks.join('');
}

/** Runs f with stderr taken for a terminal and returns what it wrote there. */
export const onTerminal = (f: () => Promise<void> | void): Promise<string> => captureStderr(f, true);

/**
 * Runs f with Date.now running `speed` times faster than real time, so a progress display's 2 s
 * delay passes within work that may take well under 2 s on a fast moment of the machine.
 */
export async function withFastClock<T>(f: () => Promise<T>, speed = 25): Promise<T> {
  const real = Date.now.bind(Date);
  const t0 = real();
  const clock = vi.spyOn(Date, 'now').mockImplementation(() => t0 + (real() - t0) * speed);
  try {
    return await f();
  } finally {
    clock.mockRestore();
  }
}
