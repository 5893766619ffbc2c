import type { EventResult, ParameterResult } from '../../analysis/results.js';
import { col, para, row, table, xref } from '../blocks.js';
import type { BuildContext, SectionRule } from '../context.js';
import { formatAge, formatAsWritten, formatCount, formatProbability, formatQuantity } from '../format.js';

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
        intervalText(e, ctx),
        `${probabilityText(e)}${e.extrapolated ? ` ${EXTRAPOLATED_MARK}` : ''}`,
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

    blocks: [
      para(
        `The ${formatCount(results.events.length)} basic ${results.events.length === 1 ? 'event' : 'events'} of the model, each number as written in the study. `,
        `Ages are taken at the snapshot date ${results.study.as_of}, from the last renewal where one is recorded, else from installation. `,
        ...(results.events.some((e) => e.common_cause_group)
          ? ['A common-cause member’s probability is its independent part; its total and the shared events are in the common-cause section', xref('common-cause', ' ({})'), '. ']
          : []),
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
        // Each footnote only when there is a row it speaks of.
        ...(rows.some((r) => r.flag) || markNote
          ? {
              note: [
                rows.some((r) => r.flag) ? 'Flagged rows use at least one number that cites no source (named after "unsourced:"); see the parameter provenance register.' : '',
                markNote.trim(),
              ]
                .filter(Boolean)
                .join(' '),
            }
          : {}),
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
    parts.push(`${field} ${key ? writtenValue(ctx.parametersByKey.get(key), quantity, value) : formatQuantity(quantity, value)}`);
  }
  if (e.model === 'switch') parts.push(`state ${e.on ? 'on' : 'off'} in the base case`);
  if (e.common_cause_group && e.common_cause_role !== 'shared') parts.push(`common-cause group ${e.common_cause_group}: total ${formatProbability(e.total_probability)}`);
  if (e.common_cause_group && e.common_cause_role === 'shared') parts.push(`shared part of common-cause group ${e.common_cause_group}`);
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

function intervalText(e: EventResult, ctx: BuildContext): string {
  for (const f of INTERVAL_FIELDS) {
    const value = e.parameters[f];
    if (value === undefined) continue;
    const key = e.parameter_keys[f];
    return writtenValue(key ? ctx.parametersByKey.get(key) : undefined, 'duration', value);
  }
  return '—';
}

/** The value as the study wrote it when it is the parameter's own value, else in the written unit. */
function writtenValue(p: ParameterResult | undefined, quantity: string, value: number): string {
  if (p && p.value === value) return p.written;
  return formatAsWritten(quantity, value, p?.written);
}

/** A common-cause member shows its independent part and says so; a shared event says it is one. */
function probabilityText(e: EventResult): string {
  if (e.model === 'switch') return e.on ? 'on (1)' : 'off (0)';
  const p = formatProbability(e.probability);
  if (e.common_cause_role === 'shared') return `${p} shared part`;
  if (e.common_cause_group) return `${p} independent part`;
  return p;
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
