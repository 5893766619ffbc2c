/**
 * The Boolean core: decision diagrams of a LogicGraph and what is computed on them. Pure
 * functions and plain data; no file system, clock or randomness.
 */
export type { GateOp, LogicGate, LogicGraph, NodeRef } from './graph.js';
export { BddManager, FALSE, HIGH, LEVEL, LOW, NODE_STRIDE, TRUE, type BddArrays, type BddManagerOptions } from './bdd.js';
export { LogicGraphError, NodeBudgetExceeded } from './errors.js';
export { variableOrder } from './order.js';
export { compile, type CompiledLogic, type CompileOptions } from './compile.js';
export { probability, probabilityPair, ProbabilityEvaluator } from './probability.js';
export {
  cutSetBounds,
  minimalCutSets,
  type CutSet,
  type CutSetOptions,
  type CutSetResult,
} from './cutsets.js';
export { importance, type ImportanceOptions, type ImportanceResult } from './importance.js';
export { countDistribution } from './count.js';
