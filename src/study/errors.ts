import type { Pos } from './types.js';

/**
 * A problem with the user's input: a study file, a data file or the command's arguments.
 * The command prints it as `file:line:col: message` plus the hint, exits 2, and never shows a stack.
 */
export class StudyError extends Error {
  constructor(
    message: string,
    /** Where it is, when there is a place to point at. */
    readonly at?: Pos,
    /** What would be right, in the user's terms. */
    readonly hint?: string,
  ) {
    super(message);
    this.name = 'StudyError';
  }

  /** One or two lines for the terminal. */
  describe(): string {
    const where = this.at ? `${this.at.file}:${this.at.line}:${this.at.col}: ` : '';
    return `${where}${this.message}${this.hint ? `\n  expected: ${this.hint}` : ''}`;
  }
}

/**
 * A problem that only follows from another one already reported: a reference to an event, gate or
 * fit whose own definition was refused. The collector reports it only when nothing else is wrong,
 * so one slip gives one message (an `installed` date after `as_of` does not also make every
 * scenario that renews the event "not a weibull event").
 */
export class FollowOnError extends StudyError {
  constructor(message: string, at?: Pos, hint?: string) {
    super(message, at, hint);
    this.name = 'FollowOnError';
  }
}

/** The errors worth showing: the root causes, or every error when all of them are follow-ons (never none). */
export function rootCauses(errors: StudyError[]): StudyError[] {
  const roots = errors.filter((e) => !(e instanceof FollowOnError));
  return roots.length > 0 ? roots : errors;
}

/** Several input problems found in one pass, reported together. */
export class StudyErrors extends Error {
  constructor(readonly errors: StudyError[]) {
    super(errors.map((e) => e.describe()).join('\n'));
    this.name = 'StudyErrors';
  }
}

/**
 * Collects input problems so one pass reports as many as it can: `attempt` runs a step and keeps
 * its StudyError(s); `throwIfAny` throws them together. Other exceptions pass through untouched.
 */
export class ErrorCollector {
  readonly errors: StudyError[] = [];

  attempt<T>(fn: () => T): T | undefined {
    try {
      return fn();
    } catch (err) {
      if (err instanceof StudyError) this.errors.push(err);
      else if (err instanceof StudyErrors) this.errors.push(...err.errors);
      else throw err;
      return undefined;
    }
  }

  /** Throws the root causes found (follow-on errors are dropped while a root cause is there). */
  throwIfAny(): void {
    if (this.errors.length > 0) throw new StudyErrors(rootCauses(this.errors));
  }
}
