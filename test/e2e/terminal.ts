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
