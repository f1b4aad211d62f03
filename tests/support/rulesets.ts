import { DEMO_RULESET, type Ruleset } from "~/rules/ruleset";

/**
 * The demo compo's ruleset as the integration and browser tests use it: a capture of one second (60 frames), not the
 * whole demo (up to 180 s of picture), so the suite stays as fast as it was, and desk viewing for the flash check,
 * the setting the tests' expectations were written for (the demo designs' small moving patterns count in a hall).
 */
export const TEST_RULESET: Ruleset = {
  ...DEMO_RULESET,
  simulation: { ...DEMO_RULESET.simulation, frames: 60 },
  flashCheck: { ...DEMO_RULESET.flashCheck, viewing: "desk" },
};
