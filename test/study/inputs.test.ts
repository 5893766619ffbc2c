// Inputs that cannot be silently wrong (issue 11): units, dates, follow-on errors, messages, caps.
// Every study here is INVENTED for the test (no real equipment or data).
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/analysis/analyze.js';
import { StudyError, StudyErrors } from '../../src/study/errors.js';
import { readStudy } from '../../src/study/read.js';
import { weibullEventProbability } from '../../src/reliability/models/index.js';
import { writeStudy, type StudyText } from '../analysis/helpers.js';
import { faultbook, tempDir } from '../cli/helpers.js';

const ONE_TOP = 'tops:\n  t: { title: Top (invented), gate: g }\ngates:\n  g: { any: [e] }\n';

/** Every input error a study raises (one StudyError or several). */
function errorsOf(parts: StudyText): StudyError[] {
  try {
    readStudy(writeStudy(parts));
  } catch (err) {
    if (err instanceof StudyErrors) return err.errors;
    if (err instanceof StudyError) return [err];
    throw err;
  }
  throw new Error('expected the study to be refused');
}

function oneEvent(fields: string): StudyText {
  return { events: `events:\n  e: { title: Event (invented), source: test-data, ${fields} }\n`, logic: ONE_TOP };
}

describe('a duration or rate needs its unit', () => {
  // Before: `repair: 10` was read as 10 years without a word (the event went to 0.95).
  it('repair: 10 names the field, shows the text and suggests units', () => {
    const [e, ...rest] = errorsOf(oneEvent('model: repairable, rate: 2e-3 /year, repair: 10'));
    expect(rest).toEqual([]);
    expect(e!.message).toBe("'e.repair' is written 10 with no unit; a duration needs one");
    expect(e!.hint).toMatch(/^"10 h"\? "10 days"\? "10 years"\? \(/);
    expect(e!.at).toMatchObject({ file: 'events.yaml', line: 2 });
  });

  it('a bare rate shows the text as written (2e-3, not 0.002) and suggests per-hour and per-year', () => {
    const [e] = errorsOf(oneEvent('model: repairable, rate: 2e-3, repair: 8 h'));
    expect(e!.message).toBe("'e.rate' is written 2e-3 with no unit; a rate needs one");
    expect(e!.hint).toMatch(/^"2e-3 \/h"\? "2e-3 \/year"\?/);
  });

  it('suggestions fit the field: an exercise interval in days, weeks or months; one unit in the singular', () => {
    const [e] = errorsOf({ events: 'events:\n  e: { title: Motor (invented), source: test-data, model: weibull, shape: 2, scale: 40 years, exercise: 1, installed: 2000 }\n', logic: ONE_TOP });
    expect(e!.hint).toMatch(/^"1 day"\? "1 week"\? "1 month"\?/);
  });

  it('a scenario set: value and a range end need their unit too', () => {
    const scenario = errorsOf({ ...oneEvent('model: repairable, rate: 2e-3 /year, repair: 8 h'), logic: `${ONE_TOP}scenarios:\n  s: { title: Slow repair, set: { e.repair: 24 } }\n` });
    expect(scenario[0]!.message).toBe("scenario 's' e.repair is written 24 with no unit; a duration needs one");
    const range = errorsOf(oneEvent('model: repairable, rate: 2e-3 /year, repair: { value: 8 h, range: [4, 16 h] }'));
    expect(range[0]!.message).toBe("'e.repair' range low end is written 4 with no unit; a duration needs one");
  });

  it('probabilities, shapes and factors stay unitless', () => {
    const study = readStudy(writeStudy({ events: 'events:\n  e: { title: Motor (invented), source: test-data, model: weibull, shape: 2.5, scale: 40 years, installed: 2000 }\n  f: { title: Valve (invented), source: test-data, model: fixed, probability: 1e-3 }\n', logic: 'tops:\n  t: { title: Top, gate: g }\ngates:\n  g: { any: [e, f] }\n' }));
    expect(study.parameters.map((p) => [p.key, p.written])).toEqual([['e.shape', '2.5'], ['e.scale', '40 years'], ['f.probability', '1e-3']]);
  });

  it('a negative duration shows the text as written, not years', () => {
    const [e] = errorsOf(oneEvent('model: repairable, rate: 2e-3 /year, repair: -8 h'));
    expect(e!.message).toBe("'e.repair' is -8 h, outside its domain");
  });
});

describe('a point value and its uncertainty agree', () => {
  it('a rate per year with a median per hour is refused (8766× apart: outside the 1st–99th percentile)', () => {
    const [e] = errorsOf(oneEvent('model: repairable, repair: 8 h, rate: { value: 2e-3 /year, uncertainty: { lognormal: { median: 2e-3 /h, ef: 3 } } }'));
    // Lognormal with median m and EF 3: σ = ln 3/1.645; the 1st percentile is m·exp(−2.326σ) (NUREG/CR-6823 definitions).
    const lo = 2e-3 * 8766 * Math.exp((-2.3263 * Math.log(3)) / 1.645);
    expect(e!.message).toContain("'e.rate' is 2e-3 /year, outside its own uncertainty's 1st–99th percentile");
    expect(e!.message).toContain(`(${Number(lo.toPrecision(4))} /year`);
  });

  it('a point value inside its distribution is accepted', () => {
    const study = readStudy(writeStudy(oneEvent('model: repairable, repair: 8 h, rate: { value: 3e-3 /year, uncertainty: { lognormal: { median: 2e-3 /year, ef: 3 } } }')));
    expect(study.parameters.find((p) => p.key === 'e.rate')!.uncertainty).toEqual({ kind: 'lognormal', median: 2e-3, ef: 3 });
  });

  it('a unit on one and not the other, or of another dimension, is refused', () => {
    expect(errorsOf(oneEvent('model: repairable, repair: 8 h, rate: { value: 2e-3 /year, uncertainty: { lognormal: { median: 2e-3, ef: 3 } } }'))[0]!.message).toBe(
      "'e.rate' is 2e-3 /year with a unit, but its uncertainty median 2e-3 has none",
    );
    expect(errorsOf(oneEvent('model: repairable, rate: 2e-3 /year, repair: { value: 8 h, uncertainty: { uniform: { min: 1e-3 /year, max: 2 days } } }'))[0]!.message).toBe(
      "'e.repair' is a duration (8 h), but its uncertainty min \"1e-3 /year\" is a rate",
    );
  });
});

describe('dates and records', () => {
  it('renewed before installed is an error', () => {
    const [e] = errorsOf({ events: 'events:\n  e: { title: Motor (invented), source: test-data, model: weibull, shape: 2, scale: 40 years, installed: 2000, renewed: 1995 }\n', logic: ONE_TOP });
    expect(e!.message).toBe("event 'e' was renewed (1995) before it was installed (2000)");
  });

  it('a life record ending after as_of is an error at its cell', () => {
    const errors = errorsOf({
      events: 'fits:\n  life: { data: data/life.csv }\nevents:\n  e: { title: Motor (invented), source: test-data, model: weibull, shape: { fit: life }, scale: { fit: life }, installed: 2000 }\n',
      logic: ONE_TOP,
      files: { 'data/life.csv': 'installed,ended,status\n1990,2000,failed\n1991,2026-07-01,failed\n' },
    });
    // One row is wrong: one error, not one more for each parameter that uses the fit.
    expect(errors.map((e) => e.describe().split('\n')[0])).toEqual(['data/life.csv:3:6: ended 2026-07-01 is after the study\'s as_of date 2026-06-30']);
  });

  it('one root error, no follow-ons: installed after as_of does not make a renewal scenario "not a weibull event"', () => {
    const errors = errorsOf({
      events: 'events:\n  e: { title: Motor (invented), source: test-data, model: weibull, shape: 2, scale: 40 years, installed: 2027 }\n',
      logic: `${ONE_TOP}scenarios:\n  s: { title: Renew, renew: { e: 2028 } }\n  s2: { title: Longer scale, set: { e.scale: 50 years } }\n`,
    });
    expect(errors.map((e) => e.message)).toEqual(["event 'e' was installed 2027, after the study's as_of date 2026-06-30"]);
  });

  it('a real unknown id in a scenario is still reported', () => {
    const errors = errorsOf({
      events: 'events:\n  e: { title: Motor (invented), source: test-data, model: weibull, shape: 2, scale: 40 years, installed: 2010 }\n',
      logic: `${ONE_TOP}scenarios:\n  s: { title: Renew, renew: { f: 2028 } }\n`,
    });
    expect(errors.map((e) => e.message)).toEqual(["scenario 's' renews 'f', which is not a weibull event"]);
  });
});

describe('ages beyond the fitted data', () => {
  // Invented records: the longest life (suspended) is 30 years.
  const parts = (installed: string): StudyText => ({
    events: `fits:\n  life: { data: data/life.csv }\nevents:\n  e: { title: Motor (invented), source: test-data, model: weibull, shape: { fit: life }, scale: { fit: life }, installed: ${installed} }\n`,
    logic: ONE_TOP,
    files: { 'data/life.csv': 'life_years,status\n12,failed\n18,failed\n22,failed\n25,failed\n30,suspended\n' },
  });

  it('warn, name event, age and data range, and mark the event in results and the appendix', async () => {
    const dir = writeStudy(parts('1986-06-30'));
    const study = readStudy(dir);
    const w = study.warnings.filter((x) => x.code === 'age-beyond-fit-data');
    expect(w.map((x) => x.message)).toEqual(["event 'e': its age at as_of, 40.0 years, is beyond the data of fit 'life' (lives up to 30.0 years, failed or suspended); its probability is an extrapolation"]);
    const results = analyze(study);
    expect(results.events[0]!.extrapolated).toEqual({ fit: 'life', age_years: 14610 / 365.25, data_max_years: 30 });
    const out = join(tempDir(), 'out');
    const r = await faultbook('run', dir, '--out', out, '--format', 'html', '--quiet');
    expect(r.code).toBe(0);
    const html = readFileSync(join(out, 'appendix.html'), 'utf8');
    expect(html).toContain('† Extrapolated: the event is older than every life');
  });

  it('an age inside the data gives no warning', () => {
    const study = readStudy(writeStudy(parts('2006')));
    expect(study.warnings.filter((x) => x.code === 'age-beyond-fit-data')).toEqual([]);
    expect(analyze(study).events[0]!.extrapolated).toBeUndefined();
  });
});

describe('silent caps become warnings', () => {
  const capped = (events: string) => analyze(readStudy(writeStudy({ events, logic: ONE_TOP, settings: '  samples: 200\n  seed: 1\n  horizon: 0' })));

  it('a tested event whose test lasts longer than its interval: P = 1 and a probability-capped warning', () => {
    // The component is out of service for the whole interval (common practice, no source).
    const r = capped('events:\n  e: { title: Pump (invented), source: test-data, model: tested, rate: 1e-3 /year, interval: 1 month, test_duration: 2 months }\n');
    expect(r.events[0]!.probability).toBe(1);
    expect(r.warnings.filter((w) => w.code === 'probability-capped').map((w) => w.message)).toEqual([
      "event 'e' (tested model) has probability 1: the test lasts as long as its interval or longer (test_duration ≥ interval), so the unavailability is 1",
    ]);
  });

  it('a Weibull event at age 0 with shape < 1 and repair gives exactly 1, with a warning', () => {
    // h(t) = (β/η)(t/η)^(β−1) is infinite at t = 0 when β < 1 (standard Weibull hazard).
    expect(weibullEventProbability({ shape: 0.8, scale: 20, age: 0, repair: 3 / 365.25 })).toBe(1);
    const r = capped('events:\n  e: { title: Relay (invented), source: test-data, model: weibull, shape: 0.8, scale: 20 years, repair: 3 days, installed: 2026-06-30 }\n');
    expect(r.events[0]!.probability).toBe(1);
    expect(r.warnings.find((w) => w.code === 'probability-capped')!.message).toMatch(/infinite hazard, so the repaired form gives probability exactly 1/);
  });

  it('the repair term capped at 1 is a warning', () => {
    const r = capped('events:\n  e: { title: Motor (invented), source: test-data, model: weibull, shape: 1, scale: 1 year, exercise: 1 month, repair: 10 years, installed: 2020 }\n');
    expect(r.warnings.find((w) => w.code === 'probability-capped')!.message).toMatch(/the repair term .* is above 1 and is capped at 1/);
  });

  it('a probability that underflows to 0 (1e-400) is a value-underflow warning', () => {
    const r = capped('events:\n  e: { title: Valve (invented), source: test-data, model: fixed, probability: 1e-400 }\n');
    expect(r.events[0]!.probability).toBe(0);
    expect(r.warnings.find((w) => w.code === 'value-underflow')!.message).toBe("'e.probability' = 1e-400 is below the smallest number the arithmetic holds and is taken as 0");
  });

  it('the CLI summary of run and check print the cap, and the appendix lists it', async () => {
    const dir = writeStudy({ events: 'events:\n  e: { title: Pump (invented), source: test-data, model: tested, rate: 1e-3 /year, interval: 1 month, test_duration: 2 months }\n', logic: ONE_TOP, settings: '  samples: 200\n  seed: 1\n  horizon: 0' });
    const out = join(tempDir(), 'out');
    const run = await faultbook('run', dir, '--out', out, '--format', 'html,json', '--quiet');
    expect(run.code).toBe(0);
    expect(run.stderr).toContain('[probability-capped]');
    const check = await faultbook('check', dir);
    expect(check.stderr).toContain('[probability-capped]');
    expect(readFileSync(join(out, 'appendix.html'), 'utf8')).toContain('probability-capped');
    expect(JSON.parse(readFileSync(join(out, 'results.json'), 'utf8')).warnings.map((w: { code: string }) => w.code)).toContain('probability-capped');
  });
});

describe('messages', () => {
  it('a misspelt option: faultbook\'s own message with the nearest option', async () => {
    const r = await faultbook('run', 'somewhere', '--ouut', 'x');
    expect(r.code).toBe(2);
    expect(r.stderr).toBe("error: faultbook run has no option '--ouut'\n  expected: one of: --help, --out, --format, --paper, --threads, --quiet; did you mean '--out'?\n");
  });

  it('a misspelt command gets "did you mean"', async () => {
    const r = await faultbook('chek', 'somewhere');
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("did you mean 'check'?");
  });

  it('a misspelt model name and scenario key get "did you mean"', () => {
    expect(errorsOf(oneEvent('model: repairabel, rate: 2e-3 /year, repair: 8 h'))[0]!.hint).toMatch(/did you mean 'repairable'\?$/);
    const [e] = errorsOf({ ...oneEvent('model: repairable, rate: 2e-3 /year, repair: 8 h'), logic: `${ONE_TOP}scenarios:\n  s: { title: x, set: { e.repiar: 1 day } }\n` });
    expect(e!.hint).toMatch(/did you mean 'e.repair'\?$/);
  });

  it('a flood of one warning code prints as one line; check --all lists every one', async () => {
    const ids = Array.from({ length: 8 }, (_, i) => `e${i}`);
    const dir = writeStudy({
      events: `events:\n${ids.map((id) => `  ${id}: { title: Valve (invented), model: fixed, probability: 1e-3 }\n`).join('')}`,
      logic: `tops:\n  t: { title: Top, gate: g }\ngates:\n  g: { any: [${ids.join(', ')}] }\n`,
    });
    const short = await faultbook('check', dir);
    expect(short.stderr.split('\n').filter((l) => l.includes('[unsourced]'))).toEqual([
      "warning: 8 warnings [unsourced], e.g. 'e0.probability', 'e1.probability', 'e2.probability' …; `faultbook check --all` lists every one",
    ]);
    const all = await faultbook('check', dir, '--all');
    expect(all.stderr.split('\n').filter((l) => l.includes('[unsourced]'))).toHaveLength(8);
  });

  it('check shows the common-cause unequal-members warning that run shows', async () => {
    const dir = writeStudy({
      events: 'events:\n  a: { title: Pump A (invented), source: test-data, model: fixed, probability: 1e-3 }\n  b: { title: Pump B (invented), source: test-data, model: fixed, probability: 2e-3 }\n',
      logic: 'tops:\n  t: { title: Both pumps, gate: g }\ngates:\n  g: { all: [a, b] }\ncommon_cause:\n  pumps: { members: [a, b], method: beta, beta: { value: 0.05, source: test-data } }\n',
      settings: '  samples: 200\n  seed: 1\n  horizon: 0',
    });
    const check = await faultbook('check', dir);
    const run = await faultbook('run', dir, '--out', join(tempDir(), 'out'), '--format', 'json', '--quiet');
    const line = (s: string) => s.split('\n').find((l) => l.includes('[ccf-unequal-totals]'));
    expect(line(check.stderr)).toBeDefined();
    expect(line(check.stderr)).toBe(line(run.stderr));
  });
});
