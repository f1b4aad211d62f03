/**
 * Thrown when scoring input cannot be counted as given (unknown criterion, value out of range,
 * duplicate score…). Carries every problem found, so a page or the CLI can list them all at once.
 */
export class ScoringInputError extends Error {
  readonly issues: string[];

  constructor(issues: string[]) {
    super(issues.length === 1 ? issues[0] : `${issues.length} problems:\n- ${issues.join("\n- ")}`);
    this.name = "ScoringInputError";
    this.issues = issues;
  }
}
