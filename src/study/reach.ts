/**
 * What lies under some nodes of a logic model: every id (gate or basic event) reachable from the
 * roots through gate inputs, the roots included. Iterative, so a deep model cannot overflow the
 * stack; plain `{ id, inputs }` data in, so the study, the analysis and the review all use it.
 */
export function reachable(gates: readonly { id: string; inputs: readonly string[] }[], roots: Iterable<string>): Set<string> {
  const byId = new Map(gates.map((g) => [g.id, g]));
  const seen = new Set<string>();
  const stack = [...roots];
  while (stack.length) {
    const id = stack.pop()!;
    if (seen.has(id)) continue;
    seen.add(id);
    for (const input of byId.get(id)?.inputs ?? []) stack.push(input);
  }
  return seen;
}
