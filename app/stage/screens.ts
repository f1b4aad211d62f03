import type { FlashSummary, PublicStats } from "~/showcase/figures";

/** The screens of stage mode, in the order they are shown (computed on the server). */
export type StageScreen =
  | { kind: "intro"; eventTitle: string; title: string; description: string; entryCount: number; skipped: number }
  | {
      kind: "entry";
      position: number;
      total: number;
      title: string;
      crew: string | null;
      stats: PublicStats;
      flash: FlashSummary;
      /** Shown dimmed with the warning on screen (stage flash mode "dim"). */
      dimmed: boolean;
      video: { src: string; type: string } | null;
      poster: string | null;
    }
  | { kind: "vote"; url: string; qrSvg: string; closesAt: string | null; timeZone: string; method: string }
  | { kind: "reveal-intro"; version: number; entryCount: number }
  | { kind: "reveal"; place: number; tied: boolean; title: string; crew: string; mixed: number; juryScore: number | null; audienceScore: number | null; step: number; steps: number }
  | { kind: "award"; award: string; citation: string; title: string; crew: string }
  | { kind: "end"; title: string };

