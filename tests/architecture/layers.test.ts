// Checks who may import whom, mechanically (the table in ARCHITECTURE.md, "Where code runs, and
// who may import whom"). A file outside every layer is itself an error.
import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative, resolve, dirname, sep } from 'node:path';
import { ROOT } from '../support/paths';

type Layer = 'core' | 'shared' | 'node' | 'ui' | 'electron';

const LAYER_DIRS: [string, Layer][] = [['src/core', 'core'], ['src/shared', 'shared'], ['src/node', 'node'], ['src/ui', 'ui'], ['electron', 'electron']];

/** Which project layers each layer may import, and which packages. */
const RULES: Record<Layer, { layers: Layer[]; packages: (spec: string) => boolean; why: string }> = {
  core: { layers: ['core'], packages: () => false, why: 'src/core is pure: nothing outside src/core (no node:*, DOM, electron, better-sqlite3)' },
  shared: { layers: ['core', 'shared'], packages: () => false, why: 'src/shared is the contract: src/core types and nothing with side effects' },
  node: { layers: ['core', 'shared', 'node'], packages: (s) => s.startsWith('node:') || s === 'better-sqlite3', why: 'src/node may use src/core, src/shared, node:* and better-sqlite3, never DOM, Vue or electron' },
  ui: { layers: ['core', 'shared', 'ui'], packages: (s) => s === 'vue' || s === 'echarts' || s.startsWith('echarts/'), why: 'src/ui may use src/core, src/shared, vue and echarts, never node:*, electron or better-sqlite3' },
  electron: { layers: ['node', 'shared', 'electron', 'core'], packages: (s) => s === 'electron' || s.startsWith('node:'), why: 'electron/ may use src/node, src/shared and electron, never src/ui internals' },
};

function filesUnder(dir: string): string[] {
  const out: string[] = [];
  let entries: string[] = [];
  try { entries = readdirSync(dir); } catch { return out; }
  for (const name of entries) {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) out.push(...filesUnder(path));
    else if (/\.(ts|vue|mts)$/.test(name) && !name.endsWith('.d.ts')) out.push(path);
  }
  return out;
}

function layerOf(path: string): Layer | undefined {
  const rel = relative(ROOT, path).split(sep).join('/');
  return LAYER_DIRS.find(([dir]) => rel === dir || rel.startsWith(dir + '/'))?.[1];
}

function importsOf(source: string): string[] {
  // Comments may mention module paths; only code counts.
  const text = source.replace(/\/\*[\s\S]*?\*\//g, '').replace(/^\s*\/\/.*$/gm, '');
  const specs: string[] = [];
  const patterns = [/\bfrom\s+['"]([^'"]+)['"]/g, /\bimport\s*\(\s*['"]([^'"]+)['"]\s*\)/g, /\bimport\s+['"]([^'"]+)['"]/g, /\brequire\s*\(\s*['"]([^'"]+)['"]\s*\)/g];
  for (const p of patterns) for (const m of text.matchAll(p)) specs.push(m[1]);
  return specs;
}

export function violations(): string[] {
  const problems: string[] = [];
  const files = [...filesUnder(join(ROOT, 'src')), ...filesUnder(join(ROOT, 'electron'))];
  for (const file of files) {
    const layer = layerOf(file);
    const rel = relative(ROOT, file);
    if (!layer) { problems.push(`${rel} is in no layer of ARCHITECTURE.md's table; move it into src/core, src/shared, src/node, src/ui or electron/.`); continue; }
    const rule = RULES[layer];
    for (const spec of importsOf(readFileSync(file, 'utf8'))) {
      if (spec.startsWith('.')) {
        const target = resolve(dirname(file), spec);
        const targetLayer = layerOf(target);
        if (!targetLayer || !rule.layers.includes(targetLayer)) {
          problems.push(`${rel} imports ${spec} (${targetLayer ?? 'outside the layers'}): ${rule.why}. See ARCHITECTURE.md, "Where code runs, and who may import whom".`);
        }
      } else if (!rule.packages(spec)) {
        problems.push(`${rel} imports package ${spec}: ${rule.why}. See ARCHITECTURE.md, "Where code runs, and who may import whom".`);
      }
    }
  }
  return problems;
}

describe('layering', () => {
  it('every source file sits in a layer and imports only what its layer may', () => {
    expect(violations()).toEqual([]);
  });
  it('the check itself catches a forbidden import', () => {
    expect(importsOf("import Database from 'better-sqlite3';\nconst x = await import('node:fs');")).toEqual(['better-sqlite3', 'node:fs']);
    expect(RULES.core.packages('node:fs')).toBe(false);
    expect(RULES.ui.packages('electron')).toBe(false);
  });
});
