/** Runs f with stderr taken for a terminal and returns what it wrote there. */
export async function onTerminal(f: () => Promise<void> | void): Promise<string> {
  const chunks: string[] = [];
  const write = process.stderr.write.bind(process.stderr);
  const tty = process.stderr.isTTY;
  process.stderr.isTTY = true;
  process.stderr.write = ((c: string | Uint8Array) => { chunks.push(String(c)); return true; }) as typeof process.stderr.write;
  try {
    await f();
  } finally {
    process.stderr.write = write;
    process.stderr.isTTY = tty;
  }
  return chunks.join('');
}
