import type { FlashSummary, PublicStats } from "~/showcase/figures";

export type StageSource = "reference" | "crew";
/** The file the big screen plays, from the start, with sound. */
export interface StageVideo {
  src: string;
  type: string;
  source: StageSource;
}
/** An organizer's sign-off to show a flagged entry: who (name) and when (ISO time). */
export interface StageSignOff {
  by: string;
  at: string;
}

/** The screens of stage mode, in the order they are shown (computed on the server). */
export type StageScreen =
  | { kind: "intro"; eventTitle: string; title: string; description: string; entryCount: number; heldBack: number }
  /** The warning slide before a flagged entry that an organizer signed off on. */
  | { kind: "flash-warning"; title: string; flash: FlashSummary; signOff: StageSignOff; timeZone: string }
  | {
      kind: "entry";
      position: number;
      total: number;
      title: string;
      crew: string | null;
      stats: PublicStats;
      flash: FlashSummary;
      /** Its flash verdict is not a measured pass; it is here only on an organizer's sign-off. */
      flagged: boolean;
      video: StageVideo | null;
      poster: string | null;
    }
  | { kind: "vote"; url: string; qrSvg: string; closesAt: string | null; timeZone: string; method: string }
  | { kind: "reveal-intro"; version: number; entryCount: number }
  | { kind: "reveal"; place: number; tied: boolean; title: string; crew: string; mixed: number; juryScore: number | null; audienceScore: number | null; step: number; steps: number }
  | { kind: "award"; award: string; citation: string; title: string; crew: string }
  | { kind: "end"; title: string };
