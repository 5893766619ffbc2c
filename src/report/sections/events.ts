import type { EventResult } from '../../analysis/results.js';
import { col, para, row, table } from '../blocks.js';
import type { BuildContext, SectionRule } from '../context.js';
import { formatAge, formatDuration, formatProbability, formatQuantity } from '../format.js';

/** Beside a probability whose age lies beyond the data of its fit (results `extrapolated`). */
const EXTRAPOLATED_MARK = '†';

/** Fields shown in their own column rather than among the other parameters. */
const INTERVAL_FIELDS = ['exercise', 'interval'];

const MODEL_WORDS: Record<string, string> = {
  fixed: 'fixed',
  rate: 'rate × exposure',
  repairable: 'repairable',
  tested: 'periodically tested',
  demand: 'per demand',
  weibull: 'Weibull (age)',
  switch: 'house event',
};

/** The basic-event table: how each probability was obtained, and from which sources. */
export const events: SectionRule = (results, ctx) => {
  if (results.events.length === 0) return null;
  const rows = results.events.map((e) =>
    row(
      [
        e.id,
        e.title,
        MODEL_WORDS[e.model] ?? e.model,
        parameterText(e, ctx),
        e.age_years !== undefined ? formatAge(e.age_years) : '—',
        intervalText(e),
        e.model === 'switch' ? (e.on ? 'on (1)' : 'off (0)') : `${formatProbability(e.probability)}${e.extrapolated ? ` ${EXTRAPOLATED_MARK}` : ''}`,
        sourceText(e, ctx),
      ],
      {
        sortKeys: [e.id, e.title, e.model, '', e.age_years ?? -1, intervalYears(e) ?? -1, e.probability, sourceText(e, ctx)],
        ...(unsourcedFields(e, ctx).length > 0 ? { flag: true } : {}),
      },
    ),
  );
  const extrapolated = results.events.filter((e) => e.extrapolated);
  const markNote = extrapolated.length
    ? ` ${EXTRAPOLATED_MARK} Extrapolated: the event is older than every life, failed or suspended, in the records behind its fit (${extrapolated
        .map((e) => `${e.id}: ${formatAge(e.extrapolated!.age_years)} against lives up to ${formatAge(e.extrapolated!.data_max_years)} in fit ${e.extrapolated!.fit}`)
        .join('; ')}).`
    : '';
  return {
    id: 'sec-events',
    number: ctx.number,
    title: 'Basic events',
    newPage: true,
    blocks: [
      para(
        `The ${results.events.length} basic events of the model. Ages are taken at the snapshot date ${results.study.as_of}, `,
        'from the last renewal where one is recorded, else from installation. The exercise or test interval is the time a ',
        'standby component may sit failed before a run or test would reveal it. Units: durations as shown, rates per year.',
      ),
      table({
        id: 'tab-events',
        number: ctx.nextTable(),
        caption: 'Basic events, models, parameters and probabilities',
        columns: [
          col('Event', 'left', { code: true, width: 'auto' }),
          col('Description', 'left', { width: 3 }),
          col('Model', 'left', { width: 'auto' }),
          col('Parameters', 'left', { width: 3 }),
          col('Age', 'right', { width: 'auto' }),
          col('Exercise / test', 'right', { width: 'auto' }),
          col('Probability', 'right', { width: 'auto' }),
          col('Source', 'left', { code: true, width: 2 }),
        ],
        rows,
        sortable: true,
        note: `Flagged rows use at least one number that cites no source (named after "unsourced:"); see the parameter provenance register.${markNote}`,
      }),
    ],
  };
};

function parameterText(e: EventResult, ctx: BuildContext): string {
  const parts: string[] = [];
  for (const [field, value] of Object.entries(e.parameters)) {
    if (INTERVAL_FIELDS.includes(field)) continue;
    const key = e.parameter_keys[field];
    const quantity = key ? ctx.parametersByKey.get(key)?.quantity ?? guessQuantity(field) : guessQuantity(field);
    parts.push(`${field} ${formatQuantity(quantity, value)}`);
  }
  if (e.model === 'switch') parts.push(`state ${e.on ? 'on' : 'off'} in the base case`);
  if (e.common_cause_group) parts.push(`common-cause group ${e.common_cause_group}`);
  return parts.join('; ') || '—';
}

/** Without a parameter record (should not happen), the field name still says what kind of number it is. */
function guessQuantity(field: string): string {
  if (['probability'].includes(field)) return 'probability';
  if (['rate'].includes(field)) return 'rate';
  if (['scale', 'exposure', 'interval', 'exercise', 'repair', 'test_duration', 'location'].includes(field)) return 'duration';
  return 'number';
}

function intervalYears(e: EventResult): number | undefined {
  for (const f of INTERVAL_FIELDS) if (e.parameters[f] !== undefined) return e.parameters[f];
  return undefined;
}

function intervalText(e: EventResult): string {
  const years = intervalYears(e);
  return years === undefined ? '—' : formatDuration(years);
}

/** The distinct sources behind an event's numbers, in field order. */
export function sourcesOf(e: EventResult, ctx: BuildContext): string[] {
  const out: string[] = [];
  for (const key of Object.values(e.parameter_keys)) {
    const s = ctx.parametersByKey.get(key)?.source;
    if (s && !out.includes(s)) out.push(s);
  }
  return out;
}

/** Fields of the event whose number cites no source. */
function unsourcedFields(e: EventResult, ctx: BuildContext): string[] {
  return Object.entries(e.parameter_keys)
    .filter(([, key]) => !ctx.parametersByKey.get(key)?.source)
    .map(([field]) => field);
}

function sourceText(e: EventResult, ctx: BuildContext): string {
  const sources = sourcesOf(e, ctx);
  const missing = unsourcedFields(e, ctx);
  const parts = [...sources];
  if (missing.length > 0) parts.push(`unsourced: ${missing.join(', ')}`);
  return parts.join(', ') || '—';
}
