/**
 * An Open-PSA MEF document (its element tree) → the plain model. Section numbers below are those
 * of the standard's text (open-psa/mef, mef/*.rst):
 *   - fault_tree_layer.rst "Description" and "XML Representation": gates, house events (false by
 *     default), basic events, the connectives and their semantics; a gate without a connective is a
 *     pass-through; events may be referred to before they are declared;
 *   - fault_tree_layer.rst "Model-Data and Components", "Solving Name Conflicts: Public versus
 *     Private Elements": containers (fault trees, components, model-data), roles, and the three
 *     ways to refer to an element (name, full path, local path);
 *   - meta_logical_layer.rst "Common Cause Groups": beta-factor, MGL and alpha-factor groups;
 *   - stochastic_layer.rst: constants, parameters, the exponential built-in.
 *
 * What faultbook cannot represent stops the import with the element, its position and what is
 * supported; nothing is dropped quietly. Nested formulae become gates of their own, named
 * `<gate>.<n>` in document order (MEF names cannot contain a dot, so these never clash).
 */
import { StudyError, StudyErrors } from '../study/errors.js';
import {
  MEMBER_TITLE_PREFIX,
  MEMBER_TOTAL_PREFIX,
  META_PREFIX,
  type PlainAttribute,
  type PlainEvent,
  type PlainGate,
  type PlainGroup,
  type PlainModel,
  type PlainProbability,
  type PlainTop,
} from './plain-model.js';
import type { XmlElement } from './xml-read.js';

const SUPPORTED_TOP_LEVEL = 'define-fault-tree, model-data, define-CCF-group (plus name, label and attributes)';
const SUPPORTED_IN_CONTAINER = 'define-gate, define-basic-event, define-house-event, define-parameter, define-CCF-group, define-component, label, attributes';
const SUPPORTED_FORMULAE = 'and, or, not, atleast, nand, nor, a reference (gate, basic-event, house-event, event) or a constant';
const SUPPORTED_EXPRESSIONS = 'float, int, a parameter reference, or exponential of a rate parameter (unit hours-1 or years-1) and a time parameter (unit hours or years)';
/** faultbook's id rule (schema/defs.schema.json `id`). */
const FAULTBOOK_ID = /^[A-Za-z][A-Za-z0-9_.-]*$/;

type DefKind = 'gate' | 'basic-event' | 'house-event' | 'parameter';

interface Definition {
  kind: DefKind;
  name: string;
  /** Names of the containers, outermost first (model-data adds none). */
  path: string[];
  isPrivate: boolean;
  element: XmlElement;
  /** Set for members declared by a CCF group. */
  group?: { element: XmlElement; path: string[] };
}

const fullName = (d: { path: string[]; name: string }): string => [...d.path, d.name].join('.');

export function readMef(root: XmlElement): PlainModel {
  return new MefReader(root).read();
}

class MefReader {
  /** Events (gates, basic, house) and parameters live in separate name spaces. */
  private readonly events = new Map<string, Definition>();
  private readonly parameters = new Map<string, Definition>();
  private readonly publicEvents = new Map<string, Definition>();
  private readonly publicParameters = new Map<string, Definition>();
  private readonly groups: { element: XmlElement; path: string[]; isPrivate: boolean }[] = [];
  private readonly attributes: PlainAttribute[] = [];
  private readonly errors: StudyError[] = [];
  private readonly attributesRead = new WeakSet<XmlElement>();
  private readonly usedParameters = new Set<Definition>();

  constructor(private readonly root: XmlElement) {}

  read(): PlainModel {
    const root = this.root;
    if (root.name !== 'opsa-mef') {
      throw new StudyError(`the root element is <${root.name}>`, root.at, 'an Open-PSA MEF document, whose root element is <opsa-mef>');
    }
    const meta: Record<string, string> = {};
    let title: string | undefined = root.attributes.name;
    for (const child of root.children) {
      switch (child.name) {
        case 'label':
          title = labelText(child) || title;
          break;
        case 'attributes':
          for (const [name, value] of this.readAttributes(child, 'the model')) {
            if (name.startsWith(META_PREFIX)) meta[name.slice(META_PREFIX.length)] = value;
          }
          break;
        case 'define-fault-tree':
          this.collect(child, [requireName(child)], false);
          break;
        case 'model-data':
          this.collect(child, [], false);
          break;
        case 'define-CCF-group':
          this.declareGroup(child, [], false);
          break;
        default:
          this.errors.push(unsupported(child, 'at the top of an MEF model', SUPPORTED_TOP_LEVEL));
      }
    }
    this.stop();
    const model: PlainModel = { meta, tops: [], gates: [], events: [], classes: [], groups: [], attributes: this.attributes, unusedParameters: [] };
    if (title) model.title = title;
    this.build(model);
    this.stop();
    return model;
  }

  private stop(): void {
    if (this.errors.length > 0) throw new StudyErrors(this.errors.splice(0));
  }

  // ── declarations ───────────────────────────────────────────────────────────────────────────

  /** Walks a container (fault tree, component, model-data) and records what it declares. */
  private collect(container: XmlElement, path: string[], containerPrivate: boolean): void {
    const isModelData = container.name === 'model-data';
    for (const child of container.children) {
      if (!isModelData && (child.name === 'label' || child.name === 'attributes')) {
        if (child.name === 'attributes') this.readAttributes(child, path.join('.'));
        continue;
      }
      const kind = DEFINES[child.name];
      // model-data holds events and parameters, not gates (mef/schema/fault_tree.rnc, model-data).
      if (kind && !(isModelData && kind === 'gate')) {
        this.declare(kind, child, path, roleOf(child, containerPrivate));
      } else if (child.name === 'define-component' && !isModelData) {
        const name = requireName(child);
        this.collect(child, [...path, name], roleOf(child, containerPrivate));
      } else if (child.name === 'define-CCF-group' && !isModelData) {
        this.declareGroup(child, path, roleOf(child, containerPrivate));
      } else {
        const where = isModelData ? 'in model-data' : `in ${container.name} '${path.join('.')}'`;
        const allowed = isModelData ? 'define-basic-event, define-house-event, define-parameter' : SUPPORTED_IN_CONTAINER;
        this.errors.push(unsupported(child, where, allowed));
      }
    }
  }

  private declare(kind: DefKind, element: XmlElement, path: string[], isPrivate: boolean, group?: Definition['group']): void {
    const name = requireName(element);
    const def: Definition = { kind, name, path, isPrivate, element, ...(group ? { group } : {}) };
    const space = kind === 'parameter' ? this.parameters : this.events;
    const publicSpace = kind === 'parameter' ? this.publicParameters : this.publicEvents;
    const key = fullName(def);
    const earlier = space.get(key) ?? (isPrivate ? undefined : publicSpace.get(name));
    if (earlier) {
      // fault_tree_layer.rst "Description": a second declaration is a defect the standard lets tools
      // resolve by keeping the last; faultbook does not guess which one the author meant.
      const member = earlier.group ?? group;
      this.errors.push(
        member
          ? new StudyError(
              `'${name}' is a member of CCF group '${member.element.attributes.name}' and is declared again (the other declaration is at line ${earlier.element.at.line}, column ${earlier.element.at.col})`,
              element.at,
              "one declaration: the group's distribution gives its members their probability, so a member needs no define-basic-event",
            )
          : new StudyError(
              `'${name}' is declared twice (first at line ${earlier.element.at.line}, column ${earlier.element.at.col})`,
              element.at,
              'one declaration per name in its name space (events and parameters each have their own)',
            ),
      );
      return;
    }
    space.set(key, def);
    if (!isPrivate) publicSpace.set(name, def);
  }

  private declareGroup(element: XmlElement, path: string[], isPrivate: boolean): void {
    requireName(element);
    this.groups.push({ element, path, isPrivate });
    const members = element.children.find((c) => c.name === 'members');
    // meta_logical_layer.rst "Common Cause Groups": the group declares its members' basic events and
    // gives them its distribution, so a member is declared here.
    for (const m of members?.children ?? []) {
      if (m.name !== 'basic-event') {
        this.errors.push(unsupported(m, 'in members', 'basic-event references'));
        continue;
      }
      this.declare('basic-event', m, path, isPrivate, { element, path });
    }
  }

  private readAttributes(element: XmlElement, owner: string): [string, string][] {
    const out: [string, string][] = [];
    for (const a of element.children) {
      if (a.name !== 'attribute') {
        this.errors.push(unsupported(a, 'in attributes', 'attribute elements'));
        continue;
      }
      const name = a.attributes.name ?? '';
      const value = a.attributes.value ?? '';
      out.push([name, value]);
      if (!name.startsWith(META_PREFIX)) this.attributes.push({ owner, name, value });
    }
    return out;
  }

  // ── references (fault_tree_layer.rst "Solving Name Conflicts") ───────────────────────────────

  /**
   * A reference made inside the containers `from`: a local path tried from the innermost container
   * outwards (which also covers full paths and private elements of enclosing containers), then a
   * public element by its plain name.
   */
  private resolve(space: 'event' | 'parameter', reference: string, from: string[]): Definition | undefined {
    const defs = space === 'event' ? this.events : this.parameters;
    for (let depth = from.length; depth >= 0; depth--) {
      const found = defs.get([...from.slice(0, depth), reference].join('.'));
      if (found && (!found.isPrivate || isWithin(from, found.path) || reference.includes('.'))) return found;
    }
    if (!reference.includes('.')) return (space === 'event' ? this.publicEvents : this.publicParameters).get(reference);
    return undefined;
  }

  /** faultbook id of a declared element: its name when public, its full path when private. */
  private idOf(def: Definition): string {
    const id = def.isPrivate ? fullName(def) : def.name;
    if (!FAULTBOOK_ID.test(id)) {
      this.errors.push(
        new StudyError(`the name '${id}' cannot be a faultbook id`, def.element.at, 'a name of ASCII letters, digits, _, - and . that starts with a letter'),
      );
    }
    return id;
  }

  // ── building the plain model ───────────────────────────────────────────────────────────────

  private build(model: PlainModel): void {
    const referenced = new Set<Definition>();
    const gateDefs = [...this.events.values()].filter((d) => d.kind === 'gate');
    const formulas = new Map<Definition, XmlElement | undefined>();
    for (const def of gateDefs) {
      const formula = this.formulaOf(def.element);
      formulas.set(def, formula);
      if (formula) this.walkReferences(formula, def.path, referenced);
    }
    this.stop();

    const usedEvents = new Set<Definition>();
    for (const def of gateDefs) {
      const formula = formulas.get(def);
      if (!formula) continue;
      const id = this.idOf(def);
      const title = titleOf(def.element);
      if (!referenced.has(def)) {
        // fault_tree_layer.rst "Description": a variable that appears only on the left of its
        // equation is a top event. A pass-through to a gate names that gate directly.
        const target = isReference(formula) ? this.resolveReference(formula, def.path) : undefined;
        if (target?.kind === 'gate') {
          model.tops.push({ id, ...(title ? { title } : {}), gate: this.idOf(target) } as PlainTop);
          continue;
        }
        model.tops.push({ id, ...(title ? { title } : {}), gate: id });
      }
      this.addGate(model, id, title, formula, def.path, usedEvents);
    }
    this.addEvents(model, usedEvents);
    this.addGroups(model);
    this.stop();
    this.checkLoops(model);
    this.listUnusedParameters(model);
  }

  /** Parameters nothing uses are not part of the model, but they are not dropped without a word either. */
  private listUnusedParameters(model: PlainModel): void {
    for (const def of this.parameters.values()) {
      if (this.usedParameters.has(def)) continue;
      this.ownerAttributes(def.element);
      const body = def.element.children.filter((c) => c.name !== 'label' && c.name !== 'attributes');
      const constant = body.length === 1 && (body[0]!.name === 'float' || body[0]!.name === 'int') ? body[0]!.attributes.value : undefined;
      const unit = def.element.attributes.unit;
      const title = titleOf(def.element);
      model.unusedParameters.push({
        name: fullName(def),
        value: constant ?? `an expression <${body[0]?.name ?? 'none'}>, not read`,
        ...(unit ? { unit } : {}),
        ...(title ? { title } : {}),
      });
    }
  }

  /** fault_tree_layer.rst "Description": the equations must contain no loop; found here, at the gate. */
  private checkLoops(model: PlainModel): void {
    const byId = new Map(model.gates.map((g) => [g.id, g]));
    const state = new Map<string, 1 | 2>();
    const visit = (id: string, trail: string[]): void => {
      const gate = byId.get(id);
      if (!gate || state.get(id) === 2) return;
      if (state.get(id) === 1) {
        const loop = [...trail.slice(trail.indexOf(id)), id].join(' → ');
        throw new StudyError(`gate '${id}' depends on itself: ${loop}`, gate.at, 'formulae without loops');
      }
      state.set(id, 1);
      for (const input of gate.inputs) visit(input, [...trail, id]);
      state.set(id, 2);
    };
    for (const g of model.gates) visit(g.id, []);
  }

  private formulaOf(gate: XmlElement): XmlElement | undefined {
    const formula = gate.children.filter((c) => c.name !== 'label' && c.name !== 'attributes');
    if (formula.length !== 1) {
      this.errors.push(new StudyError(`gate '${gate.attributes.name}' has ${formula.length} formulae`, gate.at, 'exactly one formula after the optional label and attributes'));
      return undefined;
    }
    if (!this.ownerAttributes(gate)) return undefined;
    return formula[0];
  }

  /** Keeps a definition's attributes for the assumptions register; false if they are malformed. */
  private ownerAttributes(element: XmlElement): boolean {
    if (this.attributesRead.has(element)) return true;
    this.attributesRead.add(element);
    const attrs = element.children.find((c) => c.name === 'attributes');
    if (attrs) this.readAttributes(attrs, element.attributes.name ?? element.name);
    return true;
  }

  private walkReferences(formula: XmlElement, from: string[], referenced: Set<Definition>): void {
    if (isReference(formula)) {
      const def = this.resolveReference(formula, from);
      if (def) referenced.add(def);
      return;
    }
    for (const c of formula.children) this.walkReferences(c, from, referenced);
  }

  /** The definition a reference element names, checked against the type it states. */
  private resolveReference(ref: XmlElement, from: string[]): Definition | undefined {
    const name = ref.attributes.name;
    if (!name) {
      this.errors.push(new StudyError(`<${ref.name}> has no name`, ref.at, 'a name attribute naming the event'));
      return undefined;
    }
    const stated = ref.name === 'event' ? ref.attributes.type : ref.name;
    const def = this.resolve('event', name, from);
    if (!def) {
      if (stated === 'basic-event') {
        this.errors.push(new StudyError(`basic event '${name}' is not declared, so it has no probability`, ref.at, 'a define-basic-event giving its probability (faultbook quantifies every basic event)'));
      } else {
        this.errors.push(new StudyError(`'${name}' is not declared`, ref.at, 'the name of a gate, basic event or house event declared in the model (by name, full path or local path)'));
      }
      return undefined;
    }
    if (stated && stated !== def.kind) {
      this.errors.push(new StudyError(`'${name}' is referred to as a ${stated} but declared as a ${def.kind}`, ref.at, `<${def.kind} name="${name}"/>`));
      return undefined;
    }
    return def;
  }

  /** Gate `id` from a formula element; nested formulae become gates `<id>.<n>`. */
  private addGate(model: PlainModel, id: string, title: string | undefined, formula: XmlElement, from: string[], used: Set<Definition>, generatedFrom?: string): void {
    let counter = 0;
    const nested = (parent: string, el: XmlElement): string => {
      const childId = `${id}.${++counter}`;
      define(childId, el, parent);
      return childId;
    };
    const operand = (parent: string, el: XmlElement): string | undefined => {
      if (isReference(el)) {
        const def = this.resolveReference(el, from);
        if (!def) return undefined;
        if (def.kind !== 'gate') used.add(def);
        return this.idOf(def);
      }
      if (el.name === 'constant') return this.constantEvent(model, el);
      return nested(parent, el);
    };
    const define = (gateId: string, el: XmlElement, parent?: string): void => {
      const gate: PlainGate = { id: gateId, op: 'any', inputs: [], at: el.at };
      if (gateId === id && title) gate.title = title;
      if (parent ?? generatedFrom) gate.generatedFrom = parent ?? generatedFrom!;
      model.gates.push(gate);
      const args = (els: XmlElement[]) => els.map((c) => operand(gateId, c)).filter((x): x is string => x !== undefined);
      switch (el.name) {
        case 'and':
        case 'or':
          gate.op = el.name === 'and' ? 'all' : 'any';
          // and/or are idempotent (fault_tree_layer.rst, semantics of connectives): a repeated
          // argument changes nothing, and faultbook lists each input once.
          gate.inputs = [...new Set(args(el.children))];
          break;
        case 'atleast': {
          gate.op = 'atleast';
          const k = Number(el.attributes.min);
          if (!Number.isInteger(k) || k < 1) this.errors.push(new StudyError(`atleast has min="${el.attributes.min ?? ''}"`, el.at, 'a positive integer min'));
          gate.k = k;
          gate.inputs = args(el.children);
          if (Number.isInteger(k) && k > el.children.length) {
            this.errors.push(new StudyError(`atleast min="${k}" has ${el.children.length} arguments`, el.at, `a min between 1 and ${el.children.length}`));
          }
          if (new Set(gate.inputs).size !== gate.inputs.length) {
            this.errors.push(new StudyError('atleast lists an argument twice', el.at, 'distinct arguments (faultbook counts each input once)'));
          }
          break;
        }
        case 'not':
          gate.op = 'not';
          if (el.children.length !== 1) this.errors.push(new StudyError(`not has ${el.children.length} arguments`, el.at, 'exactly one argument'));
          gate.inputs = args(el.children.slice(0, 1));
          break;
        case 'nand':
        case 'nor': {
          // fault_tree_layer.rst, semantics of connectives: F nand G = not (F and G), F nor G = not (F or G).
          gate.op = 'not';
          const inner = `${id}.${++counter}`;
          define(inner, { ...el, name: el.name === 'nand' ? 'and' : 'or' }, gateId);
          gate.inputs = [inner];
          break;
        }
        default:
          if (isReference(el) || el.name === 'constant') {
            // fault_tree_layer.rst "XML Representation": a pass-through gate has a single argument.
            const input = operand(gateId, el);
            gate.inputs = input ? [input] : [];
          } else {
            this.errors.push(unsupported(el, `in the formula of gate '${id}'`, SUPPORTED_FORMULAE));
          }
      }
    };
    define(id, formula);
  }

  /** A Boolean constant inside a formula becomes a house event of that value (made once each). */
  private constantEvent(model: PlainModel, el: XmlElement): string | undefined {
    const value = el.attributes.value;
    if (value !== 'true' && value !== 'false') {
      this.errors.push(new StudyError(`constant has value "${value ?? ''}"`, el.at, 'value="true" or value="false"'));
      return undefined;
    }
    const id = `constant.${value}`;
    if (!model.events.some((e) => e.id === id)) {
      model.events.push({ id, title: `Constant ${value} (a Boolean constant in the imported formulae)`, kind: 'house', on: value === 'true', at: el.at });
    }
    return id;
  }

  private addEvents(model: PlainModel, used: Set<Definition>): void {
    for (const def of this.events.values()) {
      if (def.kind === 'gate' || def.group) continue;
      const id = this.idOf(def);
      const title = titleOf(def.element);
      this.ownerAttributes(def.element);
      const body = def.element.children.filter((c) => c.name !== 'label' && c.name !== 'attributes');
      if (def.kind === 'house-event') {
        const constant = body[0];
        let on = false; // fault_tree_layer.rst "Description": house events are false by default.
        if (body.length > 1 || (constant && constant.name !== 'constant')) {
          this.errors.push(unsupported(body[body.length > 1 ? 1 : 0]!, `in house event '${def.name}'`, 'an optional <constant value="true|false"/>'));
        } else if (constant) {
          on = constant.attributes.value === 'true';
          if (!['true', 'false'].includes(constant.attributes.value ?? '')) this.errors.push(new StudyError('constant has no true/false value', constant.at, 'value="true" or value="false"'));
        }
        model.events.push({ id, ...(title ? { title } : {}), kind: 'house', on, at: def.element.at });
        continue;
      }
      if (body.length === 0) {
        if (used.has(def)) this.errors.push(new StudyError(`basic event '${def.name}' has no probability`, def.element.at, `an expression: ${SUPPORTED_EXPRESSIONS}`));
        else this.errors.push(new StudyError(`basic event '${def.name}' has no probability and is used by no gate`, def.element.at, 'a probability, or remove the declaration'));
        continue;
      }
      if (body.length > 1) {
        this.errors.push(unsupported(body[1]!, `in basic event '${def.name}'`, 'one expression'));
        continue;
      }
      const probability = this.probability(body[0]!, def.path, `basic event '${def.name}'`);
      if (!probability) continue;
      const event: PlainEvent = { id, kind: 'basic', probability: probability.value, at: def.element.at };
      if (title) event.title = title;
      if (body[0]!.name === 'parameter' && probability.value.kind === 'fixed') {
        event.class = this.classFor(model, body[0]!, def.path, probability.value.value);
        model.events.push(event);
        continue;
      }
      const exported = exportedModel(def.element);
      const note = exported ?? probability.note;
      if (note) event.note = note;
      model.events.push(event);
    }
  }

  /** The class standing for the parameter a basic event names (made once per parameter). */
  private classFor(model: PlainModel, ref: XmlElement, from: string[], value: number): string {
    const def = this.resolve('parameter', ref.attributes.name ?? '', from)!;
    const id = this.idOf(def);
    if (!model.classes.some((c) => c.id === id)) {
      const title = titleOf(def.element);
      model.classes.push({ id, ...(title ? { title } : {}), probability: value, parameter: fullName(def) });
    }
    return id;
  }

  private addGroups(model: PlainModel): void {
    for (const { element, path, isPrivate } of this.groups) {
      const name = element.attributes.name!;
      const id = isPrivate ? [...path, name].join('.') : name;
      const title = titleOf(element);
      const own = new Map<string, string>();
      const attrs = element.children.find((c) => c.name === 'attributes');
      if (attrs) for (const [k, v] of this.readAttributes(attrs, id)) own.set(k, v);
      const parts = new Map<string, XmlElement[]>();
      for (const c of element.children) parts.set(c.name, [...(parts.get(c.name) ?? []), c]);
      for (const c of element.children) {
        if (!['label', 'attributes', 'members', 'distribution', 'factors', 'factor'].includes(c.name)) {
          this.errors.push(unsupported(c, `in CCF group '${name}'`, 'label, attributes, members, distribution, factors'));
        }
      }
      const memberEls = parts.get('members')?.[0]?.children.filter((c) => c.name === 'basic-event') ?? [];
      const distribution = parts.get('distribution')?.[0];
      if (memberEls.length < 2 || !distribution || distribution.children.length !== 1) {
        this.errors.push(new StudyError(`CCF group '${name}' needs two or more members and one distribution`, element.at, 'members with at least two basic events, and a distribution holding one expression'));
        continue;
      }
      const total = this.probability(distribution.children[0]!, path, `the distribution of CCF group '${name}'`);
      if (!total) continue;
      const members: string[] = [];
      for (const m of memberEls) {
        const def = this.events.get([...path, m.attributes.name!].join('.'))!;
        const memberId = this.idOf(def);
        members.push(memberId);
        const ownTotal = own.get(`${MEMBER_TOTAL_PREFIX}${memberId}`);
        let probability = total.value;
        if (ownTotal !== undefined) {
          // Written by faultbook's export when the members' own totals differ (see README).
          const v = Number(ownTotal);
          if (!(v >= 0 && v <= 1)) this.errors.push(new StudyError(`attribute ${MEMBER_TOTAL_PREFIX}${memberId} is "${ownTotal}"`, element.at, 'a probability between 0 and 1'));
          probability = { kind: 'fixed', value: v };
        }
        const memberTitle = own.get(`${MEMBER_TITLE_PREFIX}${memberId}`);
        const event: PlainEvent = { id: memberId, kind: 'basic', probability, at: m.at, note: `member of CCF group ${name}${total.note ? `; ${total.note}` : ''}` };
        if (memberTitle) event.title = memberTitle;
        model.events.push(event);
      }
      const factors = this.factors(element, name, members.length, path);
      if (!factors) continue;
      const group: PlainGroup = { id, method: factors.method, members, factors: factors.values, at: element.at };
      if (title) group.title = title;
      model.groups.push(group);
    }
  }

  /** meta_logical_layer.rst "Common Cause Groups": factors by model and level. */
  private factors(element: XmlElement, name: string, m: number, path: string[]): { method: PlainGroup['method']; values: Record<string, number> } | undefined {
    const model = element.attributes.model;
    const list: XmlElement[] = [];
    for (const c of element.children) {
      if (c.name === 'factor') list.push(c);
      if (c.name === 'factors') list.push(...c.children);
    }
    const byLevel = new Map<number, number>();
    const firstLevel = model === 'alpha-factor' ? 1 : model === 'beta-factor' ? m : 2;
    list.forEach((f, i) => {
      if (f.name !== 'factor' || f.children.length !== 1) {
        this.errors.push(new StudyError(`<${f.name}> in CCF group '${name}' is not one factor with one expression`, f.at, '<factor level="k"> holding one expression'));
        return;
      }
      const level = f.attributes.level !== undefined ? Number(f.attributes.level) : firstLevel + i;
      const value = this.number(f.children[0]!, path, `factor of CCF group '${name}'`);
      if (value === undefined) return;
      if (byLevel.has(level)) this.errors.push(new StudyError(`CCF group '${name}' gives level ${level} twice`, f.at, 'one factor per level'));
      // Beta and MGL factors are conditional probabilities; alpha factors need only be ≥ 0 (scale-free).
      const upper = model === 'alpha-factor' ? Infinity : 1;
      if (!(value.value >= 0 && value.value <= upper)) {
        this.errors.push(new StudyError(`factor ${value.value} of CCF group '${name}' is out of range`, f.at, model === 'alpha-factor' ? 'a factor of zero or more' : 'a factor between 0 and 1'));
      }
      byLevel.set(level, value.value);
    });
    const expectLevels = (levels: number[], hint: string): boolean => {
      const given = [...byLevel.keys()].sort((a, b) => a - b);
      if (given.join() !== levels.join()) {
        this.errors.push(new StudyError(`CCF group '${name}' (${model}, ${m} members) gives factors for levels ${given.join(', ') || 'none'}`, element.at, hint));
        return false;
      }
      return true;
    };
    const range = (from: number, to: number) => Array.from({ length: to - from + 1 }, (_, i) => from + i);
    switch (model) {
      case 'beta-factor': {
        if (byLevel.size !== 1) {
          this.errors.push(new StudyError(`CCF group '${name}' (beta-factor) gives ${byLevel.size} factors`, element.at, 'one factor: beta'));
          return undefined;
        }
        return { method: 'beta', values: { beta: [...byLevel.values()][0]! } };
      }
      case 'MGL': {
        if (m > 4) {
          this.errors.push(new StudyError(`CCF group '${name}' (MGL) has ${m} members`, element.at, 'at most 4 members for the multiple Greek letter model in faultbook (beta, gamma, delta)'));
          return undefined;
        }
        if (!expectLevels(range(2, m), `factors for levels 2 to ${m}`)) return undefined;
        const names = ['beta', 'gamma', 'delta'];
        return { method: 'mgl', values: Object.fromEntries(range(2, m).map((k) => [names[k - 2]!, byLevel.get(k)!])) };
      }
      case 'alpha-factor': {
        if (m > 6) {
          this.errors.push(new StudyError(`CCF group '${name}' (alpha-factor) has ${m} members`, element.at, 'at most 6 members for the alpha-factor model in faultbook'));
          return undefined;
        }
        if (!expectLevels(range(1, m), `factors for levels 1 to ${m}`)) return undefined;
        // The standard's alpha-factor formula divides by Σ iα_i, so scaling every α leaves Q_k as it
        // is; faultbook states α that add up to 1, so factors that do not are scaled to.
        const sum = range(1, m).reduce((a, k) => a + byLevel.get(k)!, 0);
        if (!(sum > 0)) {
          this.errors.push(new StudyError(`the alpha factors of CCF group '${name}' add up to ${sum}`, element.at, 'alpha factors with a positive sum'));
          return undefined;
        }
        const scale = Math.abs(sum - 1) > 1e-9 ? sum : 1;
        return { method: 'alpha', values: Object.fromEntries(range(1, m).map((k) => [`alpha${k}`, byLevel.get(k)! / scale])) };
      }
      default:
        this.errors.push(
          new StudyError(`CCF group '${name}' uses model "${model ?? ''}"`, element.at, 'beta-factor, MGL or alpha-factor (faultbook has no phi-factor model)'),
        );
        return undefined;
    }
  }

  // ── expressions (stochastic_layer.rst) ───────────────────────────────────────────────────────

  private probability(el: XmlElement, from: string[], what: string): { value: PlainProbability; note?: string } | undefined {
    if (el.name === 'exponential') {
      // stochastic_layer.rst: Q(t) = 1 − exp(−λt); the units come from the parameters.
      if (el.children.length !== 2) {
        this.errors.push(new StudyError(`exponential in ${what} has ${el.children.length} arguments`, el.at, 'a rate and a time'));
        return undefined;
      }
      const rate = this.number(el.children[0]!, from, `the rate of ${what}`);
      const time = this.number(el.children[1]!, from, `the time of ${what}`);
      if (!rate || !time) return undefined;
      const rateUnit = rate.unit === 'years-1' ? '/year' : rate.unit === 'hours-1' ? '/h' : undefined;
      const exposureUnit = time.unit === 'years' ? 'years' : time.unit === 'hours' ? 'h' : undefined;
      if (!rateUnit || !exposureUnit) {
        this.errors.push(
          new StudyError(`exponential in ${what} has arguments without time units (${rate.unit ?? 'none'}, ${time.unit ?? 'none'})`, el.at, 'a rate parameter with unit hours-1 or years-1 and a time parameter with unit hours or years'),
        );
        return undefined;
      }
      if (rate.value < 0 || time.value < 0) {
        this.errors.push(new StudyError(`exponential in ${what} has a negative argument`, el.at, 'a rate and a time of zero or more'));
        return undefined;
      }
      const names = [rate.parameter, time.parameter].filter(Boolean).join(', ');
      return {
        value: { kind: 'rate', rate: rate.value, rateUnit, exposure: time.value, exposureUnit },
        ...(names ? { note: `MEF parameters ${names}` } : {}),
      };
    }
    const n = this.number(el, from, what);
    if (!n) return undefined;
    if (n.unit !== undefined && n.unit !== 'float') {
      this.errors.push(new StudyError(`${what} is a quantity in ${n.unit}, not a probability`, el.at, 'a probability (no unit, or unit float)'));
      return undefined;
    }
    if (!(n.value >= 0 && n.value <= 1)) {
      this.errors.push(new StudyError(`${what} is ${n.value}, not a probability`, el.at, 'a value between 0 and 1'));
      return undefined;
    }
    return { value: { kind: 'fixed', value: n.value }, ...(n.parameter ? { note: `MEF parameter ${n.parameter}` } : {}) };
  }

  /** A number: a constant, or a parameter (with the unit its definition or the reference states). */
  private number(el: XmlElement, from: string[], what: string, seen: Set<Definition> = new Set()): { value: number; unit?: string; parameter?: string } | undefined {
    if (el.name === 'float' || el.name === 'int') {
      const value = Number(el.attributes.value);
      if (el.attributes.value === undefined || el.attributes.value.trim() === '' || !Number.isFinite(value)) {
        this.errors.push(new StudyError(`<${el.name}> has value "${el.attributes.value ?? ''}"`, el.at, 'a finite number'));
        return undefined;
      }
      return { value };
    }
    if (el.name === 'parameter') {
      const name = el.attributes.name ?? '';
      const def = this.resolve('parameter', name, from);
      if (!def) {
        this.errors.push(new StudyError(`parameter '${name}' is not declared`, el.at, 'a define-parameter of that name (by name, full path or local path)'));
        return undefined;
      }
      this.usedParameters.add(def);
      if (seen.has(def)) {
        this.errors.push(new StudyError(`parameter '${name}' is defined in terms of itself`, el.at, 'parameters without loops'));
        return undefined;
      }
      const body = def.element.children.filter((c) => c.name !== 'label' && c.name !== 'attributes');
      this.ownerAttributes(def.element);
      if (body.length !== 1) {
        this.errors.push(new StudyError(`parameter '${def.name}' has ${body.length} expressions`, def.element.at, 'exactly one'));
        return undefined;
      }
      const inner = this.number(body[0]!, def.path, `parameter '${def.name}'`, new Set([...seen, def]));
      if (!inner) return undefined;
      const unit = el.attributes.unit ?? def.element.attributes.unit ?? inner.unit;
      return { value: inner.value, ...(unit ? { unit } : {}), parameter: inner.parameter ?? fullName(def) };
    }
    this.errors.push(unsupported(el, `in ${what}`, SUPPORTED_EXPRESSIONS));
    return undefined;
  }
}

const DEFINES: Record<string, DefKind> = {
  'define-gate': 'gate',
  'define-basic-event': 'basic-event',
  'define-house-event': 'house-event',
  'define-parameter': 'parameter',
};

const REFERENCES = new Set(['gate', 'basic-event', 'house-event', 'event']);

function isReference(el: XmlElement): boolean {
  return REFERENCES.has(el.name);
}

function isWithin(from: string[], path: string[]): boolean {
  return path.every((p, i) => from[i] === p);
}

/** fault_tree_layer.rst "Solving Name Conflicts": an element is private if it says so, or if its container is. */
function roleOf(el: XmlElement, containerPrivate: boolean): boolean {
  const role = el.attributes.role;
  return role === undefined ? containerPrivate : role === 'private';
}

function requireName(el: XmlElement): string {
  const name = el.attributes.name;
  if (!name) throw new StudyError(`<${el.name}> has no name`, el.at, 'a name attribute');
  return name;
}

/** The model and values a faultbook export names for a probability it wrote as its value at as_of. */
function exportedModel(el: XmlElement): string | undefined {
  const attrs = el.children.find((c) => c.name === 'attributes')?.children ?? [];
  const get = (name: string) => attrs.find((a) => a.attributes.name === `${META_PREFIX}${name}`)?.attributes.value;
  const parameters = get('parameters');
  const at = get('value-at');
  return parameters && at ? `value at ${at} of ${parameters}` : undefined;
}

function labelText(el: XmlElement): string {
  return el.text.replace(/\s+/g, ' ').trim();
}

function titleOf(el: XmlElement): string | undefined {
  const label = el.children.find((c) => c.name === 'label');
  const text = label ? labelText(label) : '';
  return text || undefined;
}

function unsupported(el: XmlElement, where: string, supported: string): StudyError {
  return new StudyError(`<${el.name}> ${where} is not supported by faultbook import`, el.at, `one of: ${supported}`);
}
