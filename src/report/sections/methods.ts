import { em, para, subheading } from '../blocks.js';
import type { SectionRule } from '../context.js';
import { formatNumber } from '../format.js';
import type { Block } from '../view.js';

/**
 * The methods annex: how each kind of number in this appendix is obtained, said once, near the back.
 * Each results section keeps a sentence or two of its own and points here. Only the methods this
 * study used are described, and the text speaks of the model in general terms (never of one study's
 * equipment), so it reads true for every study.
 */
export const methods: SectionRule = (results, ctx) => {
  const blocks: Block[] = [para('How the numbers of this appendix are obtained. Each section points to the paragraph it rests on.')];
  const add = (id: string, title: string, ...paragraphs: Block[]) => blocks.push(subheading(id, title), ...paragraphs);

  if (results.tops.length > 0) {
    add(
      'method-probability',
      'Top-event probability',
      para(
        'Each fault tree is compiled into a binary decision diagram and its top-event probability computed on it exactly: ',
        'no approximation, every overlap between cut sets counted once. Two cut-set approximations are shown beside it for ',
        'comparison: the rare-event sum (the sum of the listed minimal cut sets) and the min-cut upper bound (one minus the ',
        'product of one minus each cut set). They overstate the probability when cut sets are not improbable or share events, ',
        'and understate it when cut sets were dropped by the cutoff or order limit. “Exact” refers to this approximation only: ',
        'the exact value is computed with every parameter at its stated value (the point value); the spread of the parameters ',
        'is treated by the Monte Carlo analysis.',
      ),
    );
    add(
      'method-cut-sets',
      'Minimal cut sets',
      para(
        'A minimal cut set is a smallest combination of basic events whose joint occurrence causes the top event. Its share is ',
        'its probability as a fraction of the exact top-event probability; shares can add up to more than 100% because cut ',
        'sets overlap.',
      ),
    );
  }
  if (results.tops.some((t) => (t.importance?.length ?? 0) > 0)) {
    add(
      'method-importance',
      'Importance measures',
      para(
        'As defined by Vesely et al., NUREG/CR-3385 (1983). Fussell–Vesely (FV): the fraction of the top-event probability ',
        'that involves the event. Birnbaum: the top-event probability with the event certainly failed minus that with it ',
        'certainly working. Criticality: Birnbaum weighted by the event’s probability over the top’s. Risk achievement worth ',
        '(RAW): the factor by which the top-event probability rises if the event is certain; risk reduction worth (RRW): the ',
        'factor by which it falls if the event never occurs.',
      ),
    );
  }
  if (results.tops.some((t) => (t.class_importance?.length ?? 0) > 0)) {
    add(
      'method-class-importance',
      'Importance of component classes',
      para(
        'A component class groups the basic events that share one set of data. With P1 the top-event probability with every ',
        'event of the class failed, P0 with every one working and P as studied: FV = (P − P0)/P, Birnbaum = P1 − P0, ',
        'RAW = P1/P, RRW = P/P0 (the group form of the NUREG/CR-3385 measures), computed exactly on the decision diagram. A ',
        'class’s FV is also the reach of a change to its data, which moves every member at once. Class shares overlap where a ',
        'cut set holds events of two classes.',
      ),
    );
  }
  if ((results.sensitivity ?? []).length > 0) {
    const factor = results.settings['sensitivity_factor'];
    add(
      'method-sensitivity',
      'One-at-a-time sensitivity',
      para(
        'Each parameter a basic event reads is moved on its own to the low and then the high end of its range, every other ',
        'parameter at its value, and the top events quantified again. The range is the one the study states; else, for a ',
        'fitted parameter where the analysis provides them, the fit’s bounds; else the value divided and multiplied by the ',
        `study’s sensitivity factor (${typeof factor === 'number' ? formatNumber(factor) : String(factor ?? '—')}), a `,
        'probability capped at 1. Each tornado row says which. The swing is the top-event probability with the parameter ',
        'high minus that with it low; a negative swing means a larger value makes failure less likely.',
      ),
    );
  }
  if ((results.scenarios ?? []).length > 0) {
    add(
      'method-scenarios',
      'Scenarios',
      para(
        'A scenario changes the base case — parameter values, house events, planned renewals — and is quantified again at the ',
        'snapshot date. “× base” is its probability divided by the base case’s. A planned renewal takes effect on its date, so ',
        'it shows in the forecast, not at the snapshot date.',
      ),
    );
  }
  const u0 = results.uncertainty?.[0];
  if (u0) {
    add(
      'method-uncertainty',
      'Monte Carlo uncertainty',
      para(
        `The parameters’ stated uncertainty is carried to the results by ${u0.method === 'latin-hypercube' ? 'Latin hypercube sampling (McKay, Beckman & Conover, 1979)' : 'plain Monte Carlo sampling'} `,
        'with the study’s seed, so the same study gives the same numbers. In each trial every parameter with an uncertainty ',
        'distribution is drawn once, so all the events of one class share their class’s draw (the state-of-knowledge ',
        'correlation of like components); a fitted Weibull shape and scale are drawn together from the fit’s covariance on the ',
        'log scale. Every trial quantifies the top events and, where the analysis provides them, the event-tree sequences and ',
        'outcomes, the failure modes and the gate counts. Percentiles follow Hyndman and Fan’s definition 7. The run counts as ',
        'settled when its 95th percentile moved 5% or less over the second half of the trials (common practice, no source).',
      ),
      para(
        em('Mean or point value. '),
        'The point value is the model evaluated at the parameters’ stated values. The mean over the trials is usually higher: ',
        'the inputs’ distributions are skewed, and like components share one draw, so a bad draw for a redundant class counts ',
        'for more than a good one saves. A risk assessment that annualises risk (expected loss of life or cost per year) ',
        'usually carries the mean forward, because an expectation of a sum is the sum of expectations; the percentiles show ',
        'how far the state of knowledge allows it to move.',
      ),
    );
  }
  if ((results.forecast ?? []).length > 0) {
    add(
      'method-forecast',
      'Forecast',
      para(
        'The top events are quantified for each year ahead as the ageing (Weibull) components grow a year older, the other ',
        'models keeping their values. A renewal restarts its component’s age on its date. The forecast assumes the data, ',
        'exercise and maintenance stay as they are.',
      ),
    );
  }
  const groups = results.common_cause ?? [];
  if (groups.length > 0) {
    const used = new Set(groups.map((g) => (g.method === 'alpha' ? `alpha-${g.testing ?? 'non-staggered'}` : g.method)));
    const formulas: string[] = [];
    if (used.has('beta')) formulas.push('beta factor: Q_1 = (1 − β)·Q_t for each member’s independent failure, Q_m = β·Q_t for the one event failing all m members');
    if (used.has('mgl')) formulas.push('multiple Greek letter: Q_k = (ρ_1·…·ρ_k)(1 − ρ_{k+1}) / C(m−1, k−1) · Q_t with ρ_1 = 1, ρ_2 = β, ρ_3 = γ, ρ_4 = δ and ρ_{m+1} = 0');
    if (used.has('alpha-staggered')) formulas.push('alpha factor, staggered testing: Q_k = α_k / C(m−1, k−1) · Q_t');
    if (used.has('alpha-non-staggered')) formulas.push('alpha factor, non-staggered testing: Q_k = k / C(m−1, k−1) · (α_k / α_t) · Q_t with α_t = Σ k·α_k');
    add(
      'method-ccf',
      'Common-cause failures',
      para(
        'Like components can fail together from one cause, which independence would miss. Each group is expanded by the ',
        'parametric models of NUREG/CR-5485 (US NRC 1998): a member keeps its id but stands for its independent part only, ',
        'and one shared event is added for each set of members a single cause can fail together; wherever the logic uses a ',
        'member it reads “its independent part OR any shared event that includes it”. Every result of this appendix includes ',
        'the groups. A member’s total is its own model probability; its independent part is what the basic-event table and ',
        `the cut sets show. Formulas used: ${formulas.join('; ')}.`,
      ),
    );
  }
  if ((results.gate_counts ?? []).length > 0) {
    add(
      'method-counts',
      'How many fail',
      para(
        'The distribution of how many of a set fail, P(exactly j of n), is computed exactly on one binary decision diagram of ',
        'all n together, so a cause they share is counted once. Beside it is the answer for n independent items with their ',
        'own probabilities: binomial when those are equal, Poisson-binomial when they differ. The gap is what sharing costs.',
      ),
    );
  }
  if ((results.event_trees ?? []).length > 0) {
    add(
      'method-event-trees',
      'Event trees',
      para(
        'An event tree follows an initiating load, split into ranges of annual exceedance probability (AEP) or of frequency, ',
        'through its headings to an outcome. A heading’s failure branch is a fixed or per-range probability, or a condition on ',
        'the fault trees. Every sequence, range by range, is one Boolean expression on the same decision diagram as the fault ',
        'trees, so a basic event that several headings share is conditioned correctly, which a product of branch numbers is ',
        'not; the tables show both. A range’s annual probability is the difference of the AEPs that bound it, so outcomes are ',
        'annual probabilities. Loads outside the ranges are not counted.',
      ),
    );
  }
  if ((results.failure_modes ?? []).length > 0) {
    add(
      'method-failure-modes',
      'Combining failure modes',
      para(
        'Failure modes that share one load are combined within each load range, where every probability is conditional on the ',
        'same load, and only then weighted by the ranges’ annual probabilities (after R. Hill, D. Bowles, P. Jordan and ',
        'R. Nathan, ANCOLD 2003; cited from memory). Shown: the plain sum; the uni-modal bounds max P_i ≤ P ≤ 1 − Π(1 − P_i); ',
        'and the common-cause adjustment, which shares each combination of modes equally among them so that the adjusted ',
        'modes add up to the upper bound (for two modes P_A·(1 − P_B/2)).',
      ),
    );
  }
  if ((results.fits ?? []).length > 0) {
    add(
      'method-fits',
      'Life-data fits',
      para(
        'A life record is a failure or a suspension (still in service, or removed for another reason); a suspension says only ',
        'that the life was longer than its age. Each data set is fitted with a Weibull distribution. The bounds are ',
        'normal-approximation (Fisher information) bounds on the log scale, each one-sided at the stated level. On the ',
        'probability plot a Weibull distribution is a straight line: each circle is one failure at its median rank, the solid ',
        'line is the fit (slope β, crossing the 63.2% line at η), the dashed lines bound F(t), and points that bend away in a ',
        'pattern mean one Weibull does not describe the records well.',
      ),
    );
  }
  if (blocks.length === 1) return null;
  return { id: 'sec-methods', number: ctx.number, title: 'Methods', blocks };
};

