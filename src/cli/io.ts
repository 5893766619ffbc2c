/** What a command may touch of the outside world, so tests can run commands in-process. */
export interface Io {
  stdout(text: string): void;
  stderr(text: string): void;
  /** Whether stderr is a terminal (progress bars only then). */
  isTTY: boolean;
}

/** Exit codes of DESIGN.md. */
export const EXIT = { ok: 0, failure: 1, badInput: 2, verifyMismatch: 3 } as const;

/** Every subcommand has this shape: arguments after its name in, exit code out. */
export type Command = (argv: string[], io: Io) => Promise<number>;
