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
  name: string;
  email: string;
  admin?: boolean;
}

export const DEMO_PEOPLE: DemoPerson[] = [
  { key: "admin", name: "Gatecrash Admin", email: "admin@gatecrash.test", admin: true },
  { key: "organizer", name: "Mira Sandor", email: "organizer@voltagedrop.test" },
  { key: "judge1", name: "Judge Okono", email: "judge1@voltagedrop.test" },
  { key: "judge2", name: "Judge Varga", email: "judge2@voltagedrop.test" },
  { key: "judge3", name: "Judge Lindqvist", email: "judge3@voltagedrop.test" },
  ...Array.from({ length: 8 }, (_, i) => ({ key: `entrant${i + 1}`, name: `Entrant ${i + 1}`, email: `entrant${i + 1}@voltagedrop.test` })),
  { key: "audience1", name: "Pixel Pat", email: "audience1@voltagedrop.test" },
  { key: "audience2", name: "Scanline Sam", email: "audience2@voltagedrop.test" },
  { key: "audience3", name: "Vblank Vic", email: "audience3@voltagedrop.test" },
];

export const DEMO_COMPETITIONS = {
  open: {
    slug: "open-gate",
    title: "Open Gate — tiny silicon compo",
    description: "Race the beam in one or two tiles. Entries close at the deadline; the show is on Saturday night.",
    state: "open" as const,
    /** days from seeding */
    deadlineInDays: 21,
    feeAmount: 1500,
    feeCurrency: "eur",
  },
  judging: {
    slug: "first-light",
    title: "First Light — warm-up compo",
    description: "The warm-up round: the same rules as Open Gate, judged by the jury and the hall.",
    state: "judging" as const,
    deadlineInDays: -2,
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
