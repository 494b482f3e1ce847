/**
 * Import boundaries (style.md): shared/ imports nothing from src/ or server/ or framework
 * packages; src/ never imports server/; server/ never imports src/; features never import
 * each other. Run by `npm run lint`.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';

const root = path.resolve(import.meta.dirname, '..');
const problems: string[] = [];

function walk(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = path.join(dir, name);
    if (statSync(full).isDirectory()) return walk(full);
    return /\.(ts|tsx)$/.test(name) ? [full] : [];
  });
}

const importRe = /(?:import|export)\s[^'"]*?from\s+['"]([^'"]+)['"]|import\(\s*['"]([^'"]+)['"]\s*\)/g;

function importsOf(file: string): string[] {
  const text = readFileSync(file, 'utf8');
  return [...text.matchAll(importRe)].map((m) => m[1] ?? m[2]);
}

function resolveTarget(file: string, spec: string): string | null {
  if (spec.startsWith('#shared/')) return path.join(root, 'shared', spec.slice(8));
  if (spec.startsWith('#server/')) return path.join(root, 'server', spec.slice(8));
  if (spec.startsWith('.')) return path.resolve(path.dirname(file), spec);
  return null;
}

const FRAMEWORK = /^(express|react|react-dom|drizzle-orm|pg|@tanstack\/|ol|@auth\/|nodemailer|pg-boss|stripe)(\/|$)/;

for (const area of ['shared', 'src', 'server']) {
  for (const file of walk(path.join(root, area))) {
    const rel = path.relative(root, file);
    for (const spec of importsOf(file)) {
      const target = resolveTarget(file, spec);
      const targetRel = target ? path.relative(root, target) : spec;
      if (area === 'shared') {
        if (target && !targetRel.startsWith('shared')) problems.push(`${rel}: shared/ must not import ${spec}`);
        if (!target && FRAMEWORK.test(spec)) problems.push(`${rel}: shared/ must stay framework-free, but imports ${spec}`);
      }
      if (area === 'src' && target && targetRel.startsWith('server')) problems.push(`${rel}: the client must not import server code (${spec})`);
      if (area === 'server' && target && targetRel.startsWith('src')) problems.push(`${rel}: the server must not import client code (${spec})`);
      const feature = rel.match(/^src\/features\/([^/]+)\//)?.[1];
      const targetFeature = targetRel.match(/^src\/features\/([^/]+)\//)?.[1];
      if (feature && targetFeature && feature !== targetFeature && targetFeature !== 'account') {
        problems.push(`${rel}: features must not import each other (${spec}); compose them in src/app`);
      }
    }
  }
}

if (problems.length) {
  console.error(`Import boundary problems:\n${problems.map((p) => `  ${p}`).join('\n')}`);
  process.exit(1);
}
console.log('import boundaries: ok');
