/**
 * The demo scenario: an invented party with two compos. Every name, handle and address is made up.
 * Passwords are for local demos only (README.md lists them).
 */
export const DEMO_PASSWORD = "gatecrash-demo";

export const DEMO_EVENT = {
  slug: "voltage-drop-2027",
  title: "Voltage Drop 2027",
  description: "A made-up weekend party in a made-up harbour town: three nights, one big screen, one shared chip.",
  venue: "Old Ferry Terminal, Hall B (invented)",
  timeZone: "Europe/Berlin",
};

export interface DemoPerson {
  key: string;
  /** A public handle, obviously invented (shown with the name on crew and jury pages). */
  handle: string;
  /** A display name nobody real carries: hardware puns, not people. */
  name: string;
  email: string;
  admin?: boolean;
}

const ENTRANTS: [string, string][] = [
  ["goatgate", "Gus Goatgate"],
  ["kelpwire", "Kelvin Kelpwire"],
  ["quartzmole", "Quilla Quartzmole"],
  ["tinfoil", "Tilly Tinfoilbloom"],
  ["oxbow", "Oz Oxbowstatic"],
  ["brinebus", "Bri Brinebus"],
  ["lumenferret", "Lux Lumenferret"],
  ["carryflag", "Cory Carryflag"],
];

export const DEMO_PEOPLE: DemoPerson[] = [
  { key: "admin", handle: "gc-admin", name: "Gatecrash Admin", email: "admin@gatecrash.test", admin: true },
  { key: "organizer", handle: "metastable", name: "Mira Metastable", email: "organizer@voltagedrop.test" },
  { key: "judge1", handle: "jitterbug", name: "Jules Jitterbug", email: "judge1@voltagedrop.test" },
  { key: "judge2", handle: "hsync-hedda", name: "Hedda Hsyncwell", email: "judge2@voltagedrop.test" },
  { key: "judge3", handle: "overscan", name: "Otto Overscan", email: "judge3@voltagedrop.test" },
  ...ENTRANTS.map(([handle, name], i) => ({ key: `entrant${i + 1}`, handle, name, email: `entrant${i + 1}@voltagedrop.test` })),
  { key: "audience1", handle: "pixel-pat", name: "Pixel Pat", email: "audience1@voltagedrop.test" },
  { key: "audience2", handle: "scanline-sam", name: "Scanline Sam", email: "audience2@voltagedrop.test" },
  { key: "audience3", handle: "vblank-vic", name: "Vblank Vic", email: "audience3@voltagedrop.test" },
];

export const DEMO_COMPETITIONS = {
  open: {
    slug: "open-gate",
    title: "Open Gate — tiny silicon compo",
    description: "Race the beam in one or two tiles. Entries close at the deadline; the show is on Saturday night.",
    state: "open" as const,
    /** days from seeding */
    deadlineInDays: 21,
    /** the show on the big screen, days from seeding (hours after midnight UTC) */
    showInDays: 22.8,
    feeAmount: 1500,
    feeCurrency: "eur",
  },
  judging: {
    slug: "first-light",
    title: "First Light — warm-up compo",
    description: "The warm-up round: the same rules as Open Gate, judged by the jury and the hall.",
    state: "judging" as const,
    deadlineInDays: -2,
    showInDays: 1.85,
    feeAmount: 0,
    feeCurrency: "eur",
  },
};

export const DEMO_CRITERIA = [
  { name: "Visuals", weight: 2, scaleMin: 0, scaleMax: 10 },
  { name: "Sound", weight: 1, scaleMin: 0, scaleMax: 10 },
  { name: "Technique", weight: 2, scaleMin: 0, scaleMax: 10 },
  { name: "Impression", weight: 1, scaleMin: 0, scaleMax: 10 },
];

/** The party's shared vote-code sheet: one slip per visitor, voting in both compos. */
export const DEMO_PARTY_CODES = 24;

/** The party's special awards; the first already has its winner (shown once First Light's results are out). */
export const DEMO_AWARDS = [
  { title: "Best sound", citation: "For a triangle tune from one sigma-delta bit that the whole hall hummed along to.", winnerSlug: "lfsr-stars" },
  { title: "Smallest design", citation: "Fewest flip-flops for the most picture.", winnerSlug: null },
];
