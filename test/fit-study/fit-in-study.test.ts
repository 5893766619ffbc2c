// A life-data fit inside a study, end to end: from the CSV in data/ to the parameters, the event
// probabilities, results.json and the appendix. The study is test/fixtures/fit-study (invented) with
// the shared reference records (Lieblein & Zelen 1956 ball-bearing lives) as its data.
import { haveTool, PDFTOTEXT } from '../tools.js';
import { execFileSync } from 'node:child_process';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { describe, expect, it } from 'vitest';
import weibullCdf from '@stdlib/stats-base-dists-weibull-cdf';
import { faultbook, tempDir } from '../cli/helpers.js';
import { BALL_BEARINGS_PATH, DATA, analyzeStudy, buildStudy, onlyFit, referenceLives, replaceIn } from './study.js';

/** @stdlib: cdf(x, k = shape, lambda = scale). */
const cdf = (t: number, shape: number, scale: number): number => weibullCdf(t, shape, scale) as number;

/**
 * Published two-parameter Weibull MLE for the ball-bearing lives: β̂ = 2.102, η̂ = 81.88 (J. F. Lawless,
 * Statistical Models and Methods for Lifetime Data, 2nd ed., 2003; values from memory as recorded in
 * /work/shared/reference/README.md, where it is noted that they solve the likelihood equations).
 */
const PUBLISHED = { shape: 2.102, scale: 81.88 };

const sig4 = (x: number): number => Number(x.toPrecision(4));

describe('a fit in a study: records → parameters → probabilities', () => {
  it('gives the fitted parameters the published MLE values, with the provenance line', async () => {
    const dir = buildStudy();
    const out = join(tempDir(), 'out');
    const r = await faultbook('run', dir, '--format', 'json', '--out', out, '--quiet');
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const results = JSON.parse(readFileSync(join(out, 'results.json'), 'utf8'));
    const byKey = Object.fromEntries(results.parameters.map((p: { key: string }) => [p.key, p]));
    const shape = byKey['drum-bearing.shape'];
    const scale = byKey['drum-bearing.scale'];
    // The values the quantification uses are the published MLE to 4 significant figures.
    expect(sig4(shape.value)).toBe(PUBLISHED.shape);
    expect(sig4(scale.value)).toBe(PUBLISHED.scale);
    expect(shape.fit).toBe('bearing-life');
    expect(scale.fit).toBe('bearing-life');
    // The register line: where the number came from (DESIGN.md / issue wording of the provenance).
    const provenance = 'fitted from data/ball-bearings.csv: 23 failures, 0 suspensions, maximum likelihood';
    expect(shape.note).toContain(provenance);
    expect(scale.note).toContain(provenance);
    expect(shape.source).toBe('bearing-records');
    // A fitted parameter's uncertainty is the fit's own (sampled jointly from its covariance).
    expect(shape.uncertainty).toMatchObject({ kind: 'fit', fit: 'bearing-life', which: 'shape' });
    expect(scale.uncertainty).toMatchObject({ kind: 'fit', fit: 'bearing-life', which: 'scale' });

    // results.fits carries the same fit.
    expect(results.fits).toHaveLength(1);
    const fit = results.fits[0];
    expect(fit.id).toBe('bearing-life');
    expect(fit.data).toBe(DATA);
    expect(fit.provenance).toBe(provenance);
    expect([fit.rows, fit.n, fit.failures, fit.suspensions]).toEqual([23, 23, 23, 0]);
    expect(sig4(fit.shape)).toBe(PUBLISHED.shape);
    expect(sig4(fit.scale)).toBe(PUBLISHED.scale);
    expect(fit.shape).toBe(shape.value);
    expect(fit.scale).toBe(scale.value);
    expect([...fit.used_by].sort()).toEqual(['drum-bearing.scale', 'drum-bearing.shape']);
    // Bounds bracket the estimate; at a one-sided level above 50% they are strictly apart (common practice, no source).
    for (const k of ['shape', 'scale', 'b10'] as const) {
      expect(fit.bounds[k].lower).toBeLessThan(fit[k]);
      expect(fit.bounds[k].upper).toBeGreaterThan(fit[k]);
    }
    // B10 is the life at F = 0.1: F(B10) = 0.1 by @stdlib's Weibull CDF.
    expect(cdf(fit.b10, fit.shape, fit.scale)).toBeCloseTo(0.1, 12);
  });

  it('lets the fitted shape and scale set the events’ probabilities (checked with @stdlib)', () => {
    const { results } = analyzeStudy(buildStudy());
    const fit = onlyFit(results);
    // Both bearings installed 1990-01-01, snapshot 2026-06-30, no exercise or repair: P = F(age)
    // (DESIGN.md model table). Age in years of 365.25 days (DESIGN.md).
    const age = (Date.UTC(2026, 5, 30) - Date.UTC(1990, 0, 1)) / 86400000 / 365.25;
    const expected = cdf(age, fit.shape, fit.scale);
    for (const id of ['drum-bearing-1', 'drum-bearing-2']) {
      const e = results.events.find((x) => x.id === id)!;
      expect(e.parameters.shape).toBe(fit.shape);
      expect(e.parameters.scale).toBe(fit.scale);
      expect(Math.abs(e.probability / expected - 1)).toBeLessThan(1e-12);
    }
    // The published values give the same probability to the precision they are given in.
    expect(cdf(age, PUBLISHED.shape, PUBLISHED.scale) / expected - 1).toBeLessThan(1e-3);
    // Top = either bearing, independent: 1 − (1 − F)² (common practice, no source).
    expect(results.tops[0]!.probability.exact).toBeCloseTo(1 - (1 - expected) ** 2, 14);
  });

  it('carries what the plot needs: Benard median ranks and the fitted line F(t)', () => {
    const { results } = analyzeStudy(buildStudy());
    const fit = onlyFit(results);
    const lives = referenceLives();
    const n = lives.length;
    // No suspensions: the plotting positions are Benard's (i − 0.3)/(n + 0.4) at the sorted lives
    // (R. B. Abernethy, The New Weibull Handbook; /work/shared/reference/README.md).
    expect(fit.points).toHaveLength(n);
    fit.points.forEach((p, i) => {
      expect(p.t).toBeCloseTo(lives[i]!, 12);
      expect(p.F).toBeCloseTo((i + 1 - 0.3) / (n + 0.4), 12);
    });
    // The fitted line is the Weibull CDF at the fitted values (@stdlib), bracketed by its bounds,
    // and it spans the data.
    for (const c of fit.curve) {
      expect(c.F).toBeCloseTo(cdf(c.t, fit.shape, fit.scale), 12);
      expect(c.lower).toBeLessThan(c.F);
      expect(c.upper).toBeGreaterThan(c.F);
    }
    expect(fit.curve[0]!.t).toBeLessThan(lives[0]!);
    expect(fit.curve[fit.curve.length - 1]!.t).toBeGreaterThan(lives[n - 1]!);
  });

  it('counts rows excluded with a reason, and keeps them out of the fit', () => {
    // Two rows get an exclude reason (an invented edit): 23 rows in the file, 21 fitted.
    const dir = buildStudy((d) => {
      const text = readFileSync(join(d, DATA), 'utf8')
        .replace('life,status', 'life,status,exclude')
        .replace(/^(\d[^\n]*)$/gm, '$1,')
        .replace('17.88,failed,', '17.88,failed,bearing fitted wrongly (invented)')
        .replace('173.40,failed,', '173.40,failed,"test rig fault, invented"');
      writeFileSync(join(d, DATA), text);
    });
    const fit = onlyFit(analyzeStudy(dir).results);
    expect([fit.rows, fit.n, fit.failures, fit.suspensions]).toEqual([23, 21, 21, 0]);
    expect(fit.points).toHaveLength(21);
    expect(fit.provenance).toBe('fitted from data/ball-bearings.csv: 21 failures, 0 suspensions, maximum likelihood');
    expect(sig4(fit.shape)).not.toBe(PUBLISHED.shape);
  });
});

describe('a fit in a study: errors', () => {
  it('stops with exit 2 naming the CSV file and line of a bad row', async () => {
    // The reference file: 4 comment lines, the header on line 5, so 41.52 is on line 9.
    const dir = buildStudy((d) => replaceIn(d, DATA, '41.52,failed', '41.52,faild'));
    const r = await faultbook('check', dir);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('data/ball-bearings.csv:9:');
    expect(r.stderr).toContain("unknown status 'faild'");
    expect(r.stderr).not.toMatch(/\n\s+at /);
    const negative = buildStudy((d) => replaceIn(d, DATA, '54.12,failed', '-54.12,failed'));
    const n = await faultbook('run', negative, '--format', 'json', '--out', join(tempDir(), 'out'), '--quiet');
    expect(n.code).toBe(2);
    expect(n.stderr).toContain('data/ball-bearings.csv:15:');
    expect(n.stderr).toContain('not positive');
  });

  it('refuses a data path that leads out of the study folder', async () => {
    const dir = buildStudy();
    // A perfectly good file just outside the folder: it must be refused for where it is, not for what it holds.
    writeFileSync(join(dirname(dir), 'x.csv'), readFileSync(BALL_BEARINGS_PATH));
    replaceIn(dir, 'events.yaml', 'data: data/ball-bearings.csv', 'data: ../x.csv');
    const r = await faultbook('check', dir);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('events.yaml:');
    expect(r.stderr).toContain("'../x.csv' points outside the study folder");
  });
});

describe('a fit in a study: the appendix', () => {
  it('renders the fits section with the probability plot and its points', async () => {
    const dir = buildStudy();
    const out = join(tempDir(), 'out');
    const r = await faultbook('run', dir, '--format', 'html,pdf', '--out', out, '--quiet');
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const html = readFileSync(join(out, 'appendix.html'), 'utf8');
    const section = html.slice(html.indexOf('id="sec-fits"'));
    expect(html).toContain('id="sec-fits"');
    expect(section).toContain('Life-data fits');
    expect(section).toContain('fitted from data/ball-bearings.csv: 23 failures, 0 suspensions, maximum likelihood');
    const figure = section.slice(section.indexOf('id="fig-fit-bearing-life"'));
    const svg = figure.slice(figure.indexOf('<svg'), figure.indexOf('</svg>') + 6);
    expect(svg.startsWith('<svg')).toBe(true);
    const points = svg.slice(svg.indexOf('data-series="points"'));
    const pointsGroup = points.slice(0, points.indexOf('</g>'));
    expect(pointsGroup.match(/<circle /g)).toHaveLength(23);
    expect(svg).toContain('data-series="fitted"');

    const pdf = join(out, 'appendix.pdf');
    expect(existsSync(pdf)).toBe(true);
    if (!haveTool(PDFTOTEXT, 'the PDF text check of the fits section')) return;
    const text = execFileSync('pdftotext', ['-layout', pdf, '-'], { encoding: 'utf8' });
    expect(text).toContain('Life-data fits');
    expect(text).toContain('Weibull probability plot of bearing-life');
  });
});

describe('faultbook fit on the reference records', () => {
  it('prints the published MLE values', async () => {
    // The file's lives are bare (millions of revolutions); any unit will do for a unit-free fit.
    const r = await faultbook('fit', BALL_BEARINGS_PATH, '--life-unit', 'years');
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/shape β\s+2\.102\s/);
    expect(r.stdout).toMatch(/scale η \(years\)\s+81\.88\s/);
    expect(r.stdout).toContain('23 failures, 0 suspensions');
  });

  it('--json parses and holds the same fit', async () => {
    const r = await faultbook('fit', BALL_BEARINGS_PATH, '--json', '--life-unit', 'years');
    expect(r.code).toBe(0);
    const fit = JSON.parse(r.stdout);
    expect(sig4(fit.shape)).toBe(PUBLISHED.shape);
    expect(sig4(fit.scale)).toBe(PUBLISHED.scale);
    expect([fit.n, fit.failures, fit.suspensions]).toEqual([23, 23, 0]);
    expect(fit.method).toBe('mle');
  });

  // Issue 11: a bare life no longer silently means years.
  it('bare lives with no unit anywhere are an input error naming the option', async () => {
    const r = await faultbook('fit', BALL_BEARINGS_PATH);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('ball-bearings.csv:6:1: life 17.88 has no unit, and the file states none');
    expect(r.stderr).toContain('`--life-unit h`');
  });
});
