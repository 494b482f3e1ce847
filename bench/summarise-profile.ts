/** Prints the top self-time functions of a V8 .cpuprofile (node --cpu-prof), for DEVELOPERS.md. */
import { readFileSync } from 'node:fs';

interface Node {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number };
  hitCount: number;
}
const profile = JSON.parse(readFileSync(process.argv[2], 'utf8')) as {
  nodes: Node[];
  startTime: number;
  endTime: number;
  timeDeltas: number[];
};
const total = profile.nodes.reduce((n, x) => n + x.hitCount, 0);
const byFn = new Map<string, number>();
for (const n of profile.nodes) {
  const file = n.callFrame.url.replace(/^.*\/(node_modules\/[^/]+|server|shared)\//, '$1/');
  const key = `${n.callFrame.functionName || '(anonymous)'} ${file}:${n.callFrame.lineNumber + 1}`;
  byFn.set(key, (byFn.get(key) ?? 0) + n.hitCount);
}
const top = [...byFn.entries()].sort((a, b) => b[1] - a[1]).slice(0, Number(process.argv[3] ?? 15));
const wallS = (profile.endTime - profile.startTime) / 1e6;
console.log(`wall ${wallS.toFixed(1)} s; samples ${total}`);
for (const [k, v] of top) console.log(`${((100 * v) / total).toFixed(1).padStart(5)} %  ${k}`);
