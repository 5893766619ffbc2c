/**
 * Typed errors of the Boolean core. Callers (the analysis) catch these by class to decide what to
 * do: a node budget that ran out may fall back to cut-set bounds; a malformed graph is a bug in the
 * reader, not in the study, so it is reported as such.
 */

/** Thrown when a decision diagram would need more internal nodes than `maxNodes` allows. */
export class NodeBudgetExceeded extends Error {
  /** Internal nodes the manager held when it refused to make another. */
  readonly reached: number;
  /** The budget in force. */
  readonly limit: number;

  constructor(reached: number, limit: number) {
    super(`decision diagram needs more than ${limit} nodes (reached ${reached})`);
    this.name = 'NodeBudgetExceeded';
    this.reached = reached;
    this.limit = limit;
  }
}

/** Thrown when a `LogicGraph` or an option passed with it is not well formed (cycle, bad index, bad k). */
export class LogicGraphError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'LogicGraphError';
  }
}
