import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const PACKAGE_NAME = 'tiltwatch';

/**
 * Absolute path of the repository root (the folder whose package.json is Tiltwatch's).
 * Found by walking up from this file, so it holds under tsx and compiled output alike; a
 * fixed `../..` from `import.meta.url` would not (the two layouts differ in depth).
 */
export function projectRoot(): string {
  let dir = path.dirname(fileURLToPath(import.meta.url));
  for (;;) {
    const manifest = path.join(dir, 'package.json');
    if (existsSync(manifest) && (JSON.parse(readFileSync(manifest, 'utf8')) as { name?: string }).name === PACKAGE_NAME) {
      return dir;
    }
    const parent = path.dirname(dir);
    if (parent === dir) throw new Error(`cannot find the ${PACKAGE_NAME} package.json above ${fileURLToPath(import.meta.url)}`);
    dir = parent;
  }
}
