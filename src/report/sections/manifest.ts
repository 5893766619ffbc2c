import { col, para, row, table } from '../blocks.js';
import type { SectionRule } from '../context.js';
import { formatNumber, formatProbability } from '../format.js';
import type { Block } from '../view.js';

/** Settings whose values are probabilities (printed as such) rather than counts or words. */
const PROBABILITY_SETTINGS = ['cutoff'];

/**
 * The reproducibility manifest: the exact tool, every input file's SHA-256 and every setting
 * (including the random seed), so the numbers can be recomputed and compared later.
 */
export const manifest: SectionRule = (results, ctx) => {
  const settings = Object.entries(results.settings).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  const seed = results.settings.seed;
  const blocks: Block[] = [
    para(
      'Running the same version of the tool on files with the digests below, with the same settings, reproduces every ',
      'number of this appendix exactly: the outputs are byte-identical from run to run, and any random sampling is driven by the seed shown.',
    ),
    {
      kind: 'keyvalue',
      items: [
        { key: 'Tool', value: `${results.tool.name} ${results.tool.version}` },
        { key: 'Results format', value: results.format, code: true },
        { key: 'Combined input digest (SHA-256)', value: results.inputs.sha256, code: true },
        { key: 'Random seed', value: seed === undefined ? 'not set (no sampling)' : String(seed), code: true },
        { key: 'Snapshot date (as_of)', value: results.study.as_of },
      ],
    },
    table({
      id: 'tab-input-files',
      number: ctx.nextTable(),
      caption: 'Input files and their SHA-256 digests',
      columns: [col('File', 'left', { code: true, width: 'auto' }), col('SHA-256', 'left', { code: true, width: 1 })],
      rows: results.inputs.files.map((f) => row([f.path, f.sha256])),
      empty: 'No input files recorded.',
    }),
    table({
      id: 'tab-settings',
      number: ctx.nextTable(),
      caption: 'Analysis settings',
      columns: [col('Setting', 'left', { code: true, width: 'auto' }), col('Value', 'left', { width: 3 })],
      rows: settings.map(([k, v]) =>
        row([k, typeof v === 'string' ? v : PROBABILITY_SETTINGS.includes(k) ? formatProbability(v) : Number.isInteger(v) ? String(v) : formatNumber(v)]),
      ),
    }),
  ];
  return { id: 'sec-manifest', number: ctx.number, title: 'Reproducibility manifest', blocks };
};
