import { describe, expect, it } from "vitest";
import { generateDemoLayout } from "../../tests/support/demo-layout";
import { mutateAndRead } from "../../tests/support/gdsii-fuzz";

describe("fuzzing the reader with seeded byte mutations", () => {
  it("every mutated file gives a summary or a GdsiiError, nothing else", () => {
    const base = generateDemoLayout({ seed: 3, flipFlops: 12, logicCells: 60 }).bytes;
    const outcome = mutateAndRead(base, { cases: 400, seed: 20240601 });
    expect(outcome.otherErrors).toEqual([]);
    // Both outcomes must occur, or the mutations are not reaching the parser.
    expect(outcome.summaries).toBeGreaterThan(0);
    expect(outcome.gdsiiErrors).toBeGreaterThan(0);
  });
});
