/**
 * Lint: things that are allowed but suspicious. Each warning is printed by `check` and `run` and
 * listed in the appendix; none stops a run.
 */
import { extrapolation } from './fits.js';
import { reachable } from './reach.js';
import type { Study, Warning } from './types.js';

/** Weibull shapes outside this band are rare for mechanical and electrical equipment (common practice, no source). */
const SHAPE_BAND: [number, number] = [0.5, 6];

export function lint(study: Study): Warning[] {
  const out: Warning[] = [];
  const param = new Map(study.parameters.map((p) => [p.key, p]));
  const used = new Set<string>();
  for (const g of study.gates) for (const i of g.inputs) used.add(i);
  for (const g of study.commonCause) for (const m of g.members) used.add(m);
  for (const e of study.events) {
    if (!used.has(e.id)) out.push({ code: 'unused-event', message: `basic event '${e.id}' is not an input of any gate`, at: e.at });
  }
  const underTops = reachable(study.gates, study.tops.map((t) => t.gate));
  for (const g of study.gates) {
    if (!underTops.has(g.id)) out.push({ code: 'unreachable-gate', message: `gate '${g.id}' is not under any top event`, at: g.at });
  }
  for (const p of study.parameters) {
    if (!p.source) out.push({ code: 'unsourced', message: `'${p.key}' = ${p.written} cites no source`, at: p.at });
    if (p.field === 'shape' && (p.value < SHAPE_BAND[0] || p.value > SHAPE_BAND[1])) {
      out.push({ code: 'shape-band', message: `'${p.key}' = ${p.written}: a Weibull shape outside ${SHAPE_BAND[0]}–${SHAPE_BAND[1]} is unusual for this equipment; check the source`, at: p.at });
    }
  }
  for (const e of study.events) {
    const key = e.fields.exercise;
    if (key && e.ageYears !== undefined && param.get(key)!.value > e.ageYears) {
      out.push({ code: 'exercise-over-age', message: `event '${e.id}': exercise interval ${param.get(key)!.written} is longer than its age at as_of (${e.ageYears.toFixed(2)} years)`, at: e.at });
    }
  }
  for (const e of study.events) {
    const x = extrapolation(study, e);
    if (x) {
      out.push({
        code: 'age-beyond-fit-data',
        message: `event '${e.id}': its age at as_of, ${x.age_years.toFixed(1)} years, is beyond the data of fit '${x.fit}' (lives up to ${x.data_max_years.toFixed(1)} years, failed or suspended); its probability is an extrapolation`,
        at: e.at,
      });
    }
  }
  for (const p of study.parameters) {
    // 1e-400 reads as 0: a number too small for double precision silently became another number.
    const mantissa = /^[+-]?([0-9.]+)[eE]/.exec(p.written)?.[1];
    if (p.value === 0 && mantissa !== undefined && /[1-9]/.test(mantissa)) {
      out.push({ code: 'value-underflow', message: `'${p.key}' = ${p.written} is below the smallest number the arithmetic holds and is taken as 0`, at: p.at });
    }
  }
  const cited = new Set(study.parameters.map((p) => p.source).filter((s): s is string => Boolean(s)));
  for (const s of study.sources) {
    if (!cited.has(s.id)) out.push({ code: 'uncited-source', message: `source '${s.id}' is cited by no parameter`, at: s.at });
  }
  return out;
}
