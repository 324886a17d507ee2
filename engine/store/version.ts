/** The tool version recorded as provenance: from the package.json above this module (source tree or installed dist). */
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

let cached: string | undefined;

export function toolVersion(): string {
  if (cached !== undefined) return cached;
  let dir = dirname(fileURLToPath(import.meta.url));
  for (;;) {
    const file = join(dir, 'package.json');
    if (existsSync(file)) {
      const pkg = JSON.parse(readFileSync(file, 'utf8')) as { name?: string; version?: string };
      if (pkg.name === 'wellsmith' && pkg.version) return (cached = pkg.version);
    }
    const up = dirname(dir);
    if (up === dir) return (cached = 'unknown');
    dir = up;
  }
}
