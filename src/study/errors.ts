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

  throwIfAny(): void {
    if (this.errors.length > 0) throw new StudyErrors(this.errors);
  }
}
