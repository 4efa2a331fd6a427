import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { REPO_ROOT } from '../config/config.js';

/** Every .ts file under a folder, tests left out. */
function sources(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true, recursive: true })
    .filter((e) => e.isFile() && /\.tsx?$/.test(e.name) && !/\.(test|spec)\.tsx?$/.test(e.name))
    .map((e) => path.join(e.parentPath, e.name));
}

describe('one string schema', () => {
  it('every text the product takes in is read through textSchema (well-formed Unicode), never a bare z.string()', () => {
    const files = ['packages/shared/src', 'apps/server/src', 'apps/web/src'].flatMap((dir) => sources(path.join(REPO_ROOT, dir)))
      // text.ts defines it; the environment is read before the app starts and never comes from a request.
      .filter((f) => !f.endsWith(`${path.sep}text.ts`) && !f.endsWith(path.join('config', 'config.ts')));
    const offenders = files.filter((f) => /\bz\s*\.\s*string\s*\(/.test(readFileSync(f, 'utf8'))).map((f) => path.relative(REPO_ROOT, f));
    expect(offenders).toEqual([]);
  });
});
