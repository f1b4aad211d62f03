/**
 * Video modes a ruleset may name. Values from the VESA Display Monitor Timing standard (DMT),
 * 640x480 @ 60 Hz: 25.175 MHz pixel clock, 800 clocks per line, 525 lines per frame, both syncs negative.
 */
export interface VideoMode {
  id: string;
  label: string;
  pixelClockHz: number;
  h: { active: number; frontPorch: number; sync: number; backPorch: number; total: number; syncPolarity: "negative" | "positive" };
  v: { active: number; frontPorch: number; sync: number; backPorch: number; total: number; syncPolarity: "negative" | "positive" };
}

export const VIDEO_MODES: Record<string, VideoMode> = {
  "vesa-dmt-640x480-60": {
    id: "vesa-dmt-640x480-60",
    label: "640×480 @ 60 Hz (VESA DMT)",
    pixelClockHz: 25_175_000,
    h: { active: 640, frontPorch: 16, sync: 96, backPorch: 48, total: 800, syncPolarity: "negative" },
    v: { active: 480, frontPorch: 10, sync: 2, backPorch: 33, total: 525, syncPolarity: "negative" },
  },
};

export function videoMode(id: string): VideoMode {
  const mode = VIDEO_MODES[id];
  if (!mode) throw new Error(`unknown video mode "${id}"; known: ${Object.keys(VIDEO_MODES).join(", ")}`);
  return mode;
}
