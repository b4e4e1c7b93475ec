import assert from 'node:assert/strict';
import { existsSync, readdirSync, statSync } from 'node:fs';
import { builtinModules } from 'node:module';
import { join } from 'node:path';
import { test } from 'node:test';
import { ENGINE_LAYERS, type EngineLayer } from './layers';
import { type ImportOf, ROOT, importsOf, sourceFiles } from './imports';

/**
 * The engine is built in layers (docs/engine.md, "Layers"; the order is ENGINE_LAYERS): a file imports
 * its own layer and lower layers only, another layer only through that layer's index.ts (its public
 * entry), and nothing outside the engine except the job contract and its packages. No Node APIs.
 */

const ENGINE = 'shared/engine';
const CONTRACT = 'shared/jobs/contract';
const rank = (layer: string) => ENGINE_LAYERS.indexOf(layer as EngineLayer);

/** The layer a repository path lies in (a layer folder, or a file or folder inside one); null for the engine's root files and outside the engine. */
function layerOf(path: string): string | null {
  const [shared, engine, folder] = path.split('/');
  if (shared !== 'shared' || engine !== 'engine' || folder === undefined) return null;
  const absolute = join(ROOT, ENGINE, folder);
  return existsSync(absolute) && statSync(absolute).isDirectory() ? folder : null;
}

const layerImports: ImportOf[] = sourceFiles(ENGINE)
  .flatMap(importsOf)
  .filter((entry) => layerOf(entry.file) !== null);

const crossLayer = layerImports.filter((entry) => entry.target !== null && layerOf(entry.target) !== null && layerOf(entry.target) !== layerOf(entry.file));
const listed = (entries: ImportOf[]) => entries.map((entry) => `  ${entry.file}: '${entry.specifier}'`).join('\n');

test('every folder of the engine is a layer in the order, with an index.ts as its public entry', () => {
  const folders = readdirSync(join(ROOT, ENGINE)).filter((entry) => statSync(join(ROOT, ENGINE, entry)).isDirectory());
  assert.deepEqual([...folders].sort(), [...ENGINE_LAYERS].sort(), 'a new engine folder needs a place in tests/unit/structure/layers.ts and docs/engine.md');
  const withoutIndex = folders.filter((folder) => !existsSync(join(ROOT, ENGINE, folder, 'index.ts')));
  assert.deepEqual(withoutIndex, []);
});

test('no import runs up the layers', () => {
  const upward = crossLayer.filter((entry) => rank(layerOf(entry.target!)!) > rank(layerOf(entry.file)!));
  assert.equal(upward.length, 0, `imports from a higher layer:\n${listed(upward)}`);
});

test('the engine imports only itself, the job contract and packages, and no Node API', () => {
  const outside = layerImports.filter((entry) => entry.target !== null && !entry.target.startsWith(`${ENGINE}/`) && !entry.target.startsWith(CONTRACT));
  assert.equal(outside.length, 0, `imports from outside the engine:\n${listed(outside)}`);
  const node = layerImports.filter((entry) => entry.target === null && (entry.specifier.startsWith('node:') || builtinModules.includes(entry.specifier)));
  assert.equal(node.length, 0, `Node APIs in the engine:\n${listed(node)}`);
});

test('another layer is imported through its index.ts only', () => {
  const deep = crossLayer.filter((entry) => {
    const layer = layerOf(entry.target!)!;
    return entry.target !== `${ENGINE}/${layer}` && entry.target !== `${ENGINE}/${layer}/index`;
  });
  assert.equal(deep.length, 0, `cross-layer imports past the layer's index.ts:\n${listed(deep)}`);
});
