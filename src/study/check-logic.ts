/**
 * The logic model's references: every top names a gate, every gate input names a gate or a basic
 * event, no id is both, and no gate reaches itself. Unknown ids come with the nearest known ones.
 */
import { StudyError, StudyErrors } from './errors.js';
import type { BasicEvent, CommonCauseGroup, Gate, Top } from './types.js';
import type { Sections } from './sections.js';

export interface LogicParts {
  tops: Top[];
  gates: Gate[];
  events: BasicEvent[];
  commonCause: CommonCauseGroup[];
  sections: Sections;
}

export function checkLogic(parts: LogicParts): void {
  const errors: StudyError[] = [];
  const gateIds = new Map(parts.gates.map((g) => [g.id, g]));
  const eventIds = new Set(parts.events.map((e) => e.id));
  for (const g of parts.gates) {
    if (eventIds.has(g.id)) {
      const e = parts.events.find((x) => x.id === g.id)!;
      errors.push(new StudyError(`'${g.id}' is both a gate and a basic event (event at ${e.at.file}:${e.at.line})`, g.at, 'a different id for one of them'));
    }
  }
  if (parts.tops.length === 0) {
    const where = parts.sections.get('gates')?.file ?? parts.sections.get('format')?.file;
    errors.push(new StudyError('the study has no top events', where ? where.at([]) : undefined, "a 'tops:' section, e.g. 'tops: { gates-fail: { title: …, gate: some-gate } }'"));
  }
  for (const t of parts.tops) {
    if (eventIds.has(t.gate) && !gateIds.has(t.gate)) {
      errors.push(new StudyError(`top '${t.id}' names basic event '${t.gate}'; a top names a gate`, t.at, `a gate id (wrap the event in a gate, e.g. '${t.gate}-top: { any: [${t.gate}] }')`));
    } else if (!gateIds.has(t.gate)) {
      errors.push(new StudyError(`top '${t.id}' names unknown gate '${t.gate}'`, t.at, suggest(t.gate, [...gateIds.keys()], 'a gate id from logic.yaml')));
    }
  }
  // Every id, for "did you mean": made only when an input is unknown.
  let known: string[] | undefined;
  const knownIds = (): string[] => (known ??= [...gateIds.keys(), ...eventIds]);
  for (const g of parts.gates) {
    const seen = new Set<string>();
    g.inputs.forEach((input, i) => {
      const at = g.inputsAt?.[i] ?? g.at;
      if (seen.has(input)) errors.push(new StudyError(`gate '${g.id}' lists '${input}' twice`, at, 'each input once'));
      seen.add(input);
      if (!gateIds.has(input) && !eventIds.has(input)) {
        errors.push(new StudyError(`gate '${g.id}' has unknown input '${input}'`, at, suggest(input, knownIds(), 'the id of a gate or a basic event')));
      }
    });
  }
  if (errors.length === 0) {
    const cycle = findCycle(parts.gates, gateIds);
    if (cycle) {
      const g = gateIds.get(cycle[0]!)!;
      errors.push(new StudyError(`the logic loops back on itself: ${describeCycle(cycle)}`, g.at, 'a tree: no gate may depend on itself through its inputs'));
    }
  }
  if (errors.length) throw new StudyErrors(errors);
}

/** Depth-first search with colours; iterative so a deep model cannot overflow the stack. */
function findCycle(gates: Gate[], byId: Map<string, Gate>): string[] | undefined {
  const state = new Map<string, 1 | 2>(); // 1 = on the current path, 2 = done
  for (const start of gates) {
    if (state.has(start.id)) continue;
    const path: string[] = [];
    const stack: { id: string; next: number }[] = [{ id: start.id, next: 0 }];
    state.set(start.id, 1);
    path.push(start.id);
    while (stack.length) {
      const top = stack[stack.length - 1]!;
      const g = byId.get(top.id)!;
      if (top.next >= g.inputs.length) {
        state.set(top.id, 2);
        stack.pop();
        path.pop();
        continue;
      }
      const child = g.inputs[top.next++]!;
      if (!byId.has(child)) continue;
      const s = state.get(child);
      if (s === 1) return [...path.slice(path.indexOf(child)), child];
      if (s === undefined) {
        state.set(child, 1);
        path.push(child);
        stack.push({ id: child, next: 0 });
      }
    }
  }
  return undefined;
}

/** "did you mean" with the closest ids by edit distance. */
export function suggest(wrong: string, candidates: string[], fallback: string): string {
  const scored = candidates
    .map((c) => ({ c, d: editDistance(wrong, c) }))
    .filter((x) => x.d <= Math.max(2, Math.floor(wrong.length / 3)))
    .sort((a, b) => a.d - b.d || a.c.localeCompare(b.c))
    .slice(0, 3);
  return scored.length ? `${fallback}; did you mean ${scored.map((x) => `'${x.c}'`).join(' or ')}?` : fallback;
}

function editDistance(a: string, b: string): number {
  const prev = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    let diag = prev[0]!;
    prev[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const up = prev[j]!;
      prev[j] = Math.min(up + 1, prev[j - 1]! + 1, diag + (a[i - 1] === b[j - 1] ? 0 : 1));
      diag = up;
    }
  }
  return prev[b.length]!;
}

/** Steps shown at each end of a long loop; the middle is counted, not printed. */
const CYCLE_ENDS = 4;

/** A loop as `a → b → … (N more) … → y → a`, short enough for one terminal line. */
export function describeCycle(cycle: readonly string[]): string {
  if (cycle.length <= 2 * CYCLE_ENDS + 1) return cycle.join(' → ');
  const hidden = cycle.length - 2 * CYCLE_ENDS;
  return [...cycle.slice(0, CYCLE_ENDS), `… ${hidden.toLocaleString('en-US')} more gates …`, ...cycle.slice(-CYCLE_ENDS)].join(' → ');
}
