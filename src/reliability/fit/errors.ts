/**
 * The life data cannot give the fit that was asked for (too few failures, no finite maximum, …).
 * The reliability layer knows nothing of files; the study layer turns this into a StudyError that
 * points at the data file.
 */
export class FitError extends Error {
  constructor(
    message: string,
    /** What would make the fit possible, in the user's terms. */
    readonly hint?: string,
  ) {
    super(message);
    this.name = 'FitError';
  }
}
