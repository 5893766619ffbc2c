/**
 * Top-event probabilities for many cases of one study: each case's event probabilities
 * (`evaluateEvents`) pushed through a prepared decision-diagram pass (`ProbabilityEvaluator`), so
 * the logic is never re-parsed or rebuilt per case. A case that sets switches (house events) to
 * other states than the base needs its own diagram, because switches enter the diagram as
 * constants; those diagrams are compiled once per distinct set of switch states and kept.
 */
import { ProbabilityEvaluator, type CompiledLogic } from '../logic/index.js';
import type { Study } from '../study/types.js';
import { baseCase, type Case } from './case.js';
import { evaluateEvents, type EventEvaluation } from './event-probability.js';
import type { LogicModel } from './logic-model.js';
import { compileCase } from './quantify.js';

export class CaseQuantifier {
  private readonly diagrams = new Map<string, { compiled: CompiledLogic; evaluator: ProbabilityEvaluator }>();
  /** The base case's events, so a case of parameter overrides re-evaluates only what it touches. */
  private readonly base: EventEvaluation;

  constructor(
    readonly study: Study,
    readonly model: LogicModel,
    baseCompiled: CompiledLogic,
  ) {
    this.diagrams.set(this.switchKey(new Map()), this.prepare(baseCompiled));
    this.base = evaluateEvents(study, baseCase());
  }

  /** The compiled diagram and the prepared pass over the top roots for a case's switch states. */
  diagram(c: Case): { compiled: CompiledLogic; evaluator: ProbabilityEvaluator } {
    const key = this.switchKey(c.switches);
    let d = this.diagrams.get(key);
    if (!d) {
      d = this.prepare(compileCase(this.study, this.model, c.switches));
      this.diagrams.set(key, d);
    }
    return d;
  }

  /** Top probabilities (study order of tops) for given event probabilities of a case. */
  topsAt(c: Case, eventProbability: ArrayLike<number>): Float64Array {
    return this.diagram(c).evaluator.evaluate(eventProbability);
  }

  /** Top probabilities of a case, events evaluated from the study's values and the case's changes. */
  tops(c: Case): Float64Array {
    return this.topsAt(c, this.events(c));
  }

  /** The decision-diagram vector of a case (one probability per variable), from the study's values and the case's changes. */
  events(c: Case): Float64Array {
    return evaluateEvents(this.study, c, undefined, this.base).probability;
  }

  /** The base case's decision-diagram vector. */
  get baseEvents(): Float64Array {
    return this.base.probability;
  }

  private prepare(compiled: CompiledLogic): { compiled: CompiledLogic; evaluator: ProbabilityEvaluator } {
    const roots = this.model.topGates.map((g) => compiled.gateRoots[g]!);
    return { compiled, evaluator: new ProbabilityEvaluator(compiled.manager, roots) };
  }

  /** The effective state of every switch event, as compileCase resolves it, e.g. `01`. */
  private switchKey(switches: ReadonlyMap<string, boolean>): string {
    let key = '';
    for (const e of this.study.events) {
      if (e.model === 'switch') key += (switches.get(e.id) ?? e.on ?? false) ? '1' : '0';
    }
    return key;
  }
}
