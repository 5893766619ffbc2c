/**
 * The plain model between an MEF document and a study folder: faultbook's own vocabulary (tops,
 * gates any/all/atleast/not, basic and house events, common-cause groups), already resolved —
 * every reference is a faultbook id, every number is in the unit it will be written with.
 */
import type { Pos } from '../study/types.js';

/** A basic event's probability as the study will state it. */
export type PlainProbability =
  /** A probability as given (`fixed` model). */
  | { kind: 'fixed'; value: number }
  /** 1 − e^(−λt) (`rate` model), each number with its unit. */
  | { kind: 'rate'; rate: number; rateUnit: '/year' | '/h'; exposure: number; exposureUnit: 'years' | 'h' };

export interface PlainEvent {
  id: string;
  title?: string;
  kind: 'basic' | 'house';
  /** Basic events. */
  probability?: PlainProbability;
  /**
   * Basic events whose expression is one MEF parameter: the faultbook class that stands for that
   * parameter (so every event that uses it shares one parameter, as in the document).
   */
  class?: string;
  /** House events: the value the document gives (false when it gives none). */
  on?: boolean;
  /** Where the number came from in the document (parameter name, model the exporter reported). */
  note?: string;
  at: Pos;
}

export interface PlainGate {
  id: string;
  title?: string;
  op: 'any' | 'all' | 'atleast' | 'not';
  k?: number;
  inputs: string[];
  /** Made for a nested formula; `from` is the gate whose formula held it. */
  generatedFrom?: string;
  at: Pos;
}

/** An MEF parameter used as the probability of basic events: a `fixed` class of faultbook. */
export interface PlainClass {
  id: string;
  title?: string;
  probability: number;
  /** The parameter's name in the document. */
  parameter: string;
}

export interface PlainTop {
  id: string;
  title?: string;
  gate: string;
}

export interface PlainGroup {
  id: string;
  title?: string;
  method: 'beta' | 'mgl' | 'alpha';
  members: string[];
  /** Faultbook field name (beta, gamma, delta, alpha1…) → value. */
  factors: Record<string, number>;
  at: Pos;
}

/** An MEF attribute (name, value) of an element, kept for the assumptions register. */
export interface PlainAttribute {
  owner: string;
  name: string;
  value: string;
}

export interface PlainModel {
  title?: string;
  /** Study facts an export by faultbook recorded on the root element (as-of, revision, settings…). */
  meta: Record<string, string>;
  tops: PlainTop[];
  gates: PlainGate[];
  events: PlainEvent[];
  classes: PlainClass[];
  groups: PlainGroup[];
  attributes: PlainAttribute[];
  /** Parameters the document declares that no basic event or group uses: kept for the register. */
  unusedParameters: { name: string; value: string; unit?: string; title?: string }[];
}

/**
 * Names of the root-element attributes through which an export by faultbook carries study facts
 * the standard has no element for; an import reads them back when present.
 */
export const META_PREFIX = 'faultbook-';
/** CCF-group attributes giving a member's own total and title (the standard's group has one distribution). */
export const MEMBER_TOTAL_PREFIX = 'faultbook-total-of-';
export const MEMBER_TITLE_PREFIX = 'faultbook-title-of-';
