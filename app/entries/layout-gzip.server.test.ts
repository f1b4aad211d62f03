import { execFileSync } from "node:child_process";
import { describe, expect, it } from "vitest";
import { generateDemoLayout } from "../../tests/support/demo-layout";
import { gzipLayoutProblem } from "./layout-gzip.server";

// Compressed by Debian's gzip (RFC 1952), cut to the 4 KiB head the confirmation reads from the store.
const gzip = (bytes: Uint8Array) => execFileSync("gzip", ["-c", "-9"], { input: bytes }).subarray(0, 4096);

describe("a layout confirmed as .gds.gz", () => {
  it("is accepted when it inflates to a GDSII stream", () => {
    expect(gzipLayoutProblem("chip.gds.gz", gzip(generateDemoLayout({ flipFlops: 20, logicCells: 200 }).bytes))).toBeNull();
  });

  it("is refused when it holds something else, saying so", () => {
    expect(gzipLayoutProblem("chip.gds.gz", gzip(Buffer.from("module gc_entry; endmodule\n")))).toMatch(/what it holds is not a GDSII stream/);
  });

  it("is refused when it does not inflate", () => {
    const broken = Buffer.from([0x1f, 0x8b, 0x08, 0x00, 0, 0, 0, 0, 0, 0x03, 0xff, 0xff, 0xff, 0xff, 0xff, 0xff]);
    expect(gzipLayoutProblem("chip.gds.gz", broken)).toMatch(/does not inflate/);
  });
});
