/**
 * Short descriptions of changes in words, shared by comparison.json (each effect's label) and the
 * comparison report, so both say the same thing.
 */
import type { Uncertainty } from '../study/types.js';
import { formatNumber, formatQuantity } from '../report/format.js';
import type { Unit } from './apply.js';
import type { GateChange, GateSide, ParameterSide, StudyDiff } from './study-diff.js';

const OP_WORDS: Record<GateSide['op'], string> = { any: 'OR', all: 'AND', atleast: 'voting', not: 'NOT' };

export function gateLogic(g: GateSide): string {
  return g.op === 'atleast' ? `${g.k ?? '?'}/${g.inputs.length} voting` : OP_WORDS[g.op];
}

/** A parameter value as written, with the canonical value when the text alone would not show the change. */
export function parameterValue(side: ParameterSide, other?: ParameterSide): string {
  const sameText = other !== undefined && other.written === side.written && other.value !== side.value;
  return sameText || side.fit ? `${side.written} (${formatQuantity(side.quantity, side.value)}${side.fit ? `, fit ${side.fit}` : ''})` : side.written;
}

/** Fields of an uncertainty distribution that are in the parameter's own unit (the others are pure numbers). */
const IN_PARAMETER_UNIT = new Set(['median', 'mean', 'sd', 'min', 'max', 'mode', 'scale']);

export function uncertaintyText(u: Uncertainty | undefined, quantity: ParameterSide['quantity'] = 'number'): string {
  if (!u) return 'none';
  const { kind, ...rest } = u;
  const parts = Object.entries(rest).map(([k, v]) => `${k} ${typeof v === 'number' ? (IN_PARAMETER_UNIT.has(k) ? formatQuantity(quantity, v) : formatNumber(v)) : String(v)}`);
  return `${kind}${parts.length ? ` (${parts.join(', ')})` : ''}`;
}

export function gateChangeText(g: GateChange): string {
  const parts: string[] = [];
  if (g.aspects.includes('op') || g.aspects.includes('k')) parts.push(`${gateLogic(g.old)} to ${gateLogic(g.new)}`);
  if (g.aspects.includes('inputs')) {
    if (g.reordered_only) parts.push('inputs reordered');
    else {
      const io = [...g.inputs_added.map((x) => `+${x}`), ...g.inputs_removed.map((x) => `−${x}`)];
      parts.push(`inputs ${io.join(', ') || 'reordered'}`);
    }
  }
  if (g.aspects.includes('title')) parts.push('title');
  return parts.join('; ');
}

/** One line for a change that was applied alone in "what moved the answer". */
export function unitLabel(u: Unit, d: StudyDiff): string {
  switch (u.kind) {
    case 'parameter': {
      const p = d.data.parameters.changed.find((x) => x.key === u.key);
      return p ? `${u.key}: ${parameterValue(p.old, p.new)} to ${parameterValue(p.new, p.old)}` : u.key;
    }
    case 'event': {
      const e = d.logic.events.changed.find((x) => x.id === u.id);
      if (!e) return `event ${u.id}`;
      const parts = e.aspects
        .filter((a) => a !== 'title' && a !== 'assumptions')
        .map((a) => {
          switch (a) {
            case 'model':
              return `model ${e.old.model} to ${e.new.model}`;
            case 'class':
              return `class ${e.old.class ?? 'none'} to ${e.new.class ?? 'none'}`;
            case 'installed':
              return `installed ${e.old.installed ?? 'not given'} to ${e.new.installed ?? 'not given'}`;
            case 'renewed':
              return `renewed ${e.old.renewed ?? 'never'} to ${e.new.renewed ?? 'never'}`;
            case 'on':
              return `switch ${e.old.on ? 'on' : 'off'} to ${e.new.on ? 'on' : 'off'}`;
            default:
              return 'takes its numbers from other parameters';
          }
        });
      return `event ${u.id}: ${parts.join('; ')}`;
    }
    case 'gate': {
      const g = d.logic.gates.changed.find((x) => x.id === u.id);
      return g ? `gate ${u.id}: ${gateChangeText(g)}` : `gate ${u.id}`;
    }
    case 'top': {
      const t = d.logic.tops.changed.find((x) => x.id === u.id);
      return t ? `top ${u.id}: gate ${t.old.gate} to ${t.new.gate}` : `top ${u.id}`;
    }
    case 'common-cause': {
      if (d.logic.common_cause.added.some((x) => x.id === u.id)) return `common-cause group ${u.id} added`;
      if (d.logic.common_cause.removed.some((x) => x.id === u.id)) return `common-cause group ${u.id} removed`;
      const c = d.logic.common_cause.changed.find((x) => x.id === u.id);
      return `common-cause group ${u.id}: ${c ? c.aspects.join(', ') : 'changed'}`;
    }
    case 'setting': {
      const s = d.data.settings.find((x) => x.name === u.name);
      return s ? `setting ${u.name}: ${String(s.old)} to ${String(s.new)}` : `setting ${u.name}`;
    }
    case 'as_of': {
      const m = d.meta.find((x) => x.field === 'as_of');
      return `snapshot date (as_of) ${m?.old ?? '?'} to ${m?.new ?? '?'}: every age from installation or renewal moves with it`;
    }
  }
}

/**
 * How a comparison names one side: "revision B" when the two revisions have distinct names, else
 * "old revision" / "new revision" (with the name when there is one). A study without a revision
 * name, or two drafts of one revision, must not read "revision  with revision ".
 */
export function revisionName(c: { old: { revision: string }; new: { revision: string } }, side: 'old' | 'new'): string {
  const own = c[side].revision.trim();
  const other = c[side === 'old' ? 'new' : 'old'].revision.trim();
  if (own && other && own !== other) return `revision ${own}`;
  return own ? `${side} revision ${own}` : `${side} revision`;
}
