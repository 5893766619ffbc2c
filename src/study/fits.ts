/**
 * Life-data fits named in events.yaml `fits:`: each reads its records once, fits once, and keeps the
 * result on its FitSpec; a parameter written `{ fit: id }` takes the fitted shape, scale or location.
 */
import { FitError, fitWeibull, type WeibullFit } from '../reliability/fit/index.js';
import { StudyError } from './errors.js';
import { fitData, parseLifeData } from './life-data.js';
import type { BasicEvent, FitSpec, Parameter, Pos, Study } from './types.js';

export type ReadText = (rel: string, at: Pos) => string;

/** `asOf`: the study's snapshot date; a record that ends after it is an error. */
export function runFit(fit: FitSpec, readText: ReadText, asOf?: string): WeibullFit {
  if (fit.result) return fit.result;
  const text = readText(fit.data, fit.at);
  const records = parseLifeData(text, fit.data, {
    ...(fit.lifeUnit !== undefined ? { lifeUnit: fit.lifeUnit } : {}),
    ...(asOf !== undefined ? { asOf } : {}),
    unitOption: `'life_unit: h' (or years, days…) on fit '${fit.id}'`,
  });
  const data = fitData(records, fit.group);
  fit.dataMaxYears = Math.max(...data.map((d) => d.time));
  try {
    fit.result = fitWeibull(data, { method: fit.method, threeParameter: fit.threeParameter, confidence: fit.confidence });
  } catch (err) {
    if (err instanceof FitError) throw new StudyError(`fit '${fit.id}' of ${fit.data}: ${err.message}`, fit.at, err.hint ?? 'life records with enough failures to fit');
    throw err;
  }
  fit.rows = records.records.length;
  return fit.result;
}

/**
 * Parameters by key, made once per parameter list: extrapolation is asked for every event, and a
 * search through the list each time grows with the square of the study. The index is remade when
 * the list's length changes (a list is only ever appended to).
 */
const parameterIndexes = new WeakMap<readonly Parameter[], { length: number; byKey: Map<string, Parameter> }>();

function parameterByKey(parameters: readonly Parameter[], key: string): Parameter | undefined {
  let index = parameterIndexes.get(parameters);
  if (!index || index.length !== parameters.length) {
    const byKey = new Map<string, Parameter>();
    // The first of a key wins, as a search from the front would find it.
    for (const p of parameters) if (!byKey.has(p.key)) byKey.set(p.key, p);
    index = { length: parameters.length, byKey };
    parameterIndexes.set(parameters, index);
  }
  return index.byKey.get(key);
}

/**
 * Where an event's age lies beyond the data behind its fitted shape or scale: older than every life,
 * failed or suspended, the fit used. The model still gives a number, but an extrapolated one.
 */
export function extrapolation(study: Pick<Study, 'parameters' | 'fits'>, event: BasicEvent): { fit: string; age_years: number; data_max_years: number } | undefined {
  if (event.model !== 'weibull' || event.ageYears === undefined) return undefined;
  for (const field of ['shape', 'scale'] as const) {
    const key = event.fields[field];
    const fitId = key ? parameterByKey(study.parameters, key)?.fit : undefined;
    const fit = fitId ? study.fits.find((f) => f.id === fitId) : undefined;
    if (fit?.dataMaxYears !== undefined && event.ageYears > fit.dataMaxYears) {
      return { fit: fit.id, age_years: event.ageYears, data_max_years: fit.dataMaxYears };
    }
  }
  return undefined;
}

/** Provenance line for the register: "fitted from data/x.csv: 14 failures, 61 suspensions, maximum likelihood". */
export function fitProvenance(fit: FitSpec): string {
  const r = fit.result!;
  const method = fit.method === 'mle' ? 'maximum likelihood' : 'median-rank regression';
  const group = fit.group ? ` (group ${fit.group})` : '';
  return `fitted from ${fit.data}${group}: ${r.failures} failures, ${r.suspensions} suspensions, ${method}${fit.threeParameter ? ', three-parameter' : ''}`;
}

/** The value a `{ fit: id }` parameter takes, in years for scale and location. */
export function fittedValue(fit: FitSpec, field: string, at: Pos): { value: number; written: string } {
  const r = fit.result!;
  const value = field === 'shape' ? r.shape : field === 'scale' ? r.scale : field === 'location' ? (r.location ?? 0) : undefined;
  if (value === undefined) {
    throw new StudyError(`'${field}' cannot come from a life-data fit`, at, 'fit: only for shape, scale or location of a weibull model');
  }
  if (field === 'location' && r.location === undefined) {
    throw new StudyError(`fit '${fit.id}' has no location; it is a two-parameter fit`, at, `'location: true' on fit '${fit.id}' for a three-parameter fit`);
  }
  return { value, written: `${Number(value.toPrecision(4))}${field === 'shape' ? '' : ' years'}` };
}
