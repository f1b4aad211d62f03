/** The shape of an entry's check report as pages and the polling API hand it to the browser. */
export interface EntryCheck {
  uploadId: string;
  uploadNumber: number;
  run: {
    id: string;
    /** superseded: a newer upload of the entry came in before this one was checked */
    state: "queued" | "running" | "done" | "error" | "superseded";
    step: string | null;
    verdict: "pass" | "warn" | "fail" | null;
    figures: Record<string, unknown>;
    error: string | null;
    queuedAt: string;
    finishedAt: string | null;
    /** while queued: where the entry's check stands in the line (1 = next), and how many checks run now */
    queue: { place: number; running: number } | null;
  } | null;
  findings: {
    step: string;
    rule: string;
    verdict: "pass" | "warn" | "fail";
    title: string;
    measured: string | null;
    limit: string | null;
    evidence: string | null;
    advice: string | null;
  }[];
  artifacts: Record<string, { id: string; url: string; mediaType: string; sizeBytes: number }>;
}
