/**
 * Writes a function as bench/buddy/build.c reads it (format in that file): variables by level,
 * gates in an order where each comes after its inputs. Shared by the benchmarks that compare with
 * BuDDy.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { LogicGraph } from '../../src/logic/graph.js';

const here = dirname(fileURLToPath(import.meta.url));

/** Gates in an order where every gate comes after its inputs (post-order from each gate). */
export function buildOrder(graph: LogicGraph): number[] {
  const seen = new Uint8Array(graph.gates.length);
  const out: number[] = [];
  for (let s = 0; s < graph.gates.length; s++) {
    if (seen[s]) continue;
    const stack: [number, number][] = [[s, 0]];
    seen[s] = 1;
    while (stack.length) {
      const top = stack[stack.length - 1]!;
      const inputs = graph.gates[top[0]]!.inputs;
      if (top[1] < inputs.length) {
        const r = inputs[top[1]++]!;
        if (r.kind === 'gate' && !seen[r.index]) {
          seen[r.index] = 1;
          stack.push([r.index, 0]);
        }
      } else {
        out.push(top[0]);
        stack.pop();
      }
    }
  }
  return out;
}

/**
 * @param p p[v] = probability of variable v
 * @param order order[level] = variable
 * @param nodeHint BuDDy's initial node table; 0 lets BuDDy start small and collect as it normally does
 */
export function writeBuddyDump(path: string, graph: LogicGraph, p: ArrayLike<number>, top: number, order: readonly number[], nodeHint: number): void {
  const levelOf = new Int32Array(order.length);
  order.forEach((v, l) => (levelOf[v] = l));
  const seq = buildOrder(graph);
  const pos = new Int32Array(graph.gates.length);
  seq.forEach((g, i) => (pos[g] = i));
  const lines = [`vars ${order.length}`, `nodes ${nodeHint}`, `p ${order.map((v) => String(p[v])).join(' ')}`, `gates ${seq.length}`];
  for (const g of seq) {
    const gate = graph.gates[g]!;
    const refs = gate.inputs.map((r) =>
      r.kind === 'var' ? `v${levelOf[r.index]}` : r.kind === 'gate' ? `g${pos[r.index]}` : r.value ? 'c1' : 'c0',
    );
    lines.push(`gate ${gate.op} ${gate.k ?? 0} ${refs.length} ${refs.join(' ')}`);
  }
  lines.push(`top ${pos[top]}`);
  writeFileSync(path, lines.join('\n') + '\n');
}

/** Compiles bench/buddy/build.c into `outDir`; the binary's path, or why it could not be built. */
export function prepareBuddy(outDir: string): string | { skipped: string } {
  const gccOk = spawnSync('gcc', ['--version'], { encoding: 'utf8' });
  if (gccOk.status !== 0) return { skipped: 'gcc not found' };
  if (!existsSync('/usr/include/bdd.h')) return { skipped: 'libbdd-dev (bdd.h) not installed' };
  mkdirSync(outDir, { recursive: true });
  const bin = join(outDir, 'buddy-build');
  const cc = spawnSync('gcc', ['-O2', '-o', bin, join(here, 'build.c'), '-lbdd'], { encoding: 'utf8' });
  if (cc.status !== 0) return { skipped: `gcc failed: ${cc.stderr.trim().slice(0, 300)}` };
  return bin;
}
