/**
 * The photosensitivity caution of stage mode, shared by the big screen and the organizer's running order.
 * Gatecrash does not dim flagged entries: dimming keeps a flash a flash (caution.test.ts measures a black↔white
 * flicker shown at 40 % opacity with our own WCAG 2.3.1 analyser, and it still fails).
 */
export const STAGE_FLASH_CAUTION =
  "Dimming is not a safety measure: a dimmed black↔white flash still changes relative luminance by more than the 10 % of WCAG 2.2's general-flash threshold. " +
  "Entries the flash check flagged, or has not measured, are left out of the show unless an organizer signs off after reading this warning; the sign-off is recorded in the audit log.";

export const STAGE_AUDIO_CAUTION = "Sound is a 1-bit PWM pin, a full-scale square wave: play it through a low-pass filter and start at low volume.";
