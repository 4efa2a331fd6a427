#!/usr/bin/env node
// What the recorder route (/codes/:id/record) loads, from the Vite build output: the entry
// script, the route's lazy chunk, and every chunk they import statically (followed through),
// raw and gzipped. Dynamic imports (the details sheet, other routes) are listed apart: they are
// loaded only when used.  Run after `pnpm build`:  node bench/route-weight.mjs [routeChunkName]
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { gzipSync } from 'node:zlib';

const out = (line = '') => process.stdout.write(line + '\n');
const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const DIST = path.join(ROOT, 'apps/web/dist');
const ASSETS = path.join(DIST, 'assets');
// The route's lazy chunks: the signed-in layout around it and the pad's own route module.
const routes = process.argv.length > 2 ? process.argv.slice(2) : ['signed-in', 'record'];

const html = readFileSync(path.join(DIST, 'index.html'), 'utf8');
const entry = /<script[^>]+src="\/assets\/([^"]+\.js)"/.exec(html)?.[1];
const routeChunks = routes.map((route) => {
  const found = readdirSync(ASSETS).find((f) => new RegExp(`^${route}-[\\w-]+\\.js$`).test(f));
  if (!found) throw new Error(`no ${route}-*.js chunk in ${ASSETS}: run pnpm build`);
  return found;
});
if (!entry) throw new Error(`no entry script in ${DIST}/index.html: run pnpm build`);

const staticImports = (code) =>
  [
    ...code.matchAll(/(?:import|export)\s*(?:[\w*${}\s,]*?\s*from\s*)?["']\.\/([\w.-]+\.js)["']/g),
  ].map((m) => m[1]);
const dynamicImports = (code) =>
  [...code.matchAll(/import\(\s*["'`]\.\/([\w.-]+\.js)["'`]\s*\)/g)].map((m) => m[1]);

const loaded = new Set();
const lazy = new Set();
const visit = (file) => {
  if (loaded.has(file)) return;
  loaded.add(file);
  const code = readFileSync(path.join(ASSETS, file), 'utf8');
  for (const f of dynamicImports(code)) lazy.add(f);
  for (const f of staticImports(code)) visit(f);
};
visit(entry);
for (const c of routeChunks) visit(c);

let raw = 0;
let gz = 0;
const rows = [...loaded].map((file) => {
  const buf = readFileSync(path.join(ASSETS, file));
  const g = gzipSync(buf, { level: 9 }).length;
  raw += buf.length;
  gz += g;
  return { file, raw: buf.length, gz: g };
});
rows.sort((a, b) => b.gz - a.gz);
const kb = (n) => (n / 1024).toFixed(1).padStart(7);
for (const r of rows) out(`${kb(r.raw)} KB ${kb(r.gz)} KB gzip  ${r.file}`);
out(
  `${kb(raw)} KB ${kb(gz)} KB gzip  TOTAL JavaScript for /codes/:id/record (${rows.length} files)`,
);
const later = [...lazy].filter((f) => !loaded.has(f));
out(`loaded later, on demand: ${later.length} chunks (other routes, the details sheet...)`);
