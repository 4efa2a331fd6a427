import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

// Features meet only in route modules (src/app): a feature never imports another feature, and
// the shared layers (lib, components, hooks, config) never import a feature.
const SRC = import.meta.dirname;

function filesUnder(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((d) =>
    d.isDirectory() ? filesUnder(path.join(dir, d.name)) : /\.tsx?$/.test(d.name) ? [path.join(dir, d.name)] : [],
  );
}

/** The features a file imports, by folder name. */
function importedFeatures(file: string): string[] {
  return [...readFileSync(file, 'utf8').matchAll(/from '(\.[^']*)'/g)]
    .map((m) => path.relative(SRC, path.resolve(path.dirname(file), m[1]!)).split(path.sep))
    .filter((parts) => parts[0] === 'features')
    .map((parts) => parts[1]!);
}

describe('web feature boundaries', () => {
  it('a feature imports no other feature', () => {
    const offenders = filesUnder(path.join(SRC, 'features')).flatMap((f) => {
      const own = path.relative(SRC, f).split(path.sep)[1];
      return importedFeatures(f).filter((feature) => feature !== own).map((feature) => `${path.relative(SRC, f)} imports features/${feature}`);
    });
    expect(offenders).toEqual([]);
  });

  it('lib, components, hooks and config import no feature', () => {
    const shared = ['lib', 'components', 'hooks', 'config'].flatMap((d) => {
      try {
        return filesUnder(path.join(SRC, d));
      } catch {
        return [];
      }
    });
    const offenders = shared.flatMap((f) => importedFeatures(f).map((feature) => `${path.relative(SRC, f)} imports features/${feature}`));
    expect(offenders).toEqual([]);
  });
});
