import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

// The server's modules meet through their services: a repository is the module's own way to its
// tables, so another module never holds one (it would bypass the service's rules and audit).
const SRC = import.meta.dirname;

function filesUnder(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((d) =>
    d.isDirectory() ? filesUnder(path.join(dir, d.name)) : d.name.endsWith('.ts') ? [path.join(dir, d.name)] : [],
  );
}

const sources = filesUnder(SRC).filter((f) => !f.endsWith('.spec.ts'));
/** The composition root and the command-line tools build the app (or work before it starts): not modules. */
const COMPOSITION = new Set(['app.factory.ts', 'main.ts', 'cli']);

describe('server module boundaries', () => {
  it('no module exports a repository', () => {
    const offenders = sources
      .filter((f) => f.endsWith('.module.ts'))
      .flatMap((f) => {
        const exportsList = /exports:\s*\[([^\]]*)\]/s.exec(readFileSync(f, 'utf8'))?.[1] ?? '';
        return exportsList.split(',').map((n) => n.trim()).filter((n) => n.endsWith('Repository')).map((n) => `${path.relative(SRC, f)} exports ${n}`);
      });
    expect(offenders).toEqual([]);
  });

  it("no file imports another module's repository", () => {
    const offenders = sources.flatMap((f) => {
      const folder = path.relative(SRC, f).split(path.sep)[0]!;
      if (COMPOSITION.has(folder)) return [];
      return [...readFileSync(f, 'utf8').matchAll(/from '(\.\.?\/[^']*\.repository\.js)'/g)]
        .map((m) => path.relative(SRC, path.resolve(path.dirname(f), m[1]!)))
        .filter((target) => target.split(path.sep)[0] !== folder)
        .map((target) => `${path.relative(SRC, f)} imports ${target}`);
    });
    expect(offenders).toEqual([]);
  });
});
