import { describe, expect, it } from "vitest";
import { checkLicence } from "./licence";

// Identifiers and OSI approval as the SPDX License List publishes them (spdx.org/licenses, the "OSI Approved"
// column): MIT, Apache-2.0, BSD-3-Clause, CERN-OHL-P-2.0 and CERN-OHL-S-2.0 are approved; CC-BY-4.0 and
// CC-BY-NC-4.0 are not. Expression syntax: SPDX specification 2.3, annex D.
const free = { required: false, openOnly: false };
const openOnly = { required: true, openOnly: true };

describe("the licence field", () => {
  it("takes SPDX identifiers and expressions", () => {
    expect(checkLicence("MIT", free)).toEqual({ ok: true, licence: "MIT", open: true });
    expect(checkLicence(" CERN-OHL-S-2.0 ", free)).toEqual({ ok: true, licence: "CERN-OHL-S-2.0", open: true });
    expect(checkLicence("MIT OR Apache-2.0", free)).toMatchObject({ ok: true, open: true });
    expect(checkLicence("CC-BY-4.0", free)).toEqual({ ok: true, licence: "CC-BY-4.0", open: false });
    expect(checkLicence("LicenseRef-our-party-terms", free)).toMatchObject({ ok: true, open: false });
  });

  it("refuses what is not SPDX, saying so", () => {
    expect(checkLicence("MIT-ish", free)).toMatchObject({ ok: false, message: expect.stringMatching(/not an SPDX licence/) });
    expect(checkLicence("do what you like", free)).toMatchObject({ ok: false });
    expect(checkLicence("MIT AND", free)).toMatchObject({ ok: false });
  });

  it("can be required, and limited to OSI-approved licences", () => {
    expect(checkLicence("", openOnly)).toMatchObject({ ok: false, message: expect.stringMatching(/asks for the licence/) });
    expect(checkLicence("", free)).toEqual({ ok: true, licence: null, open: false });
    expect(checkLicence("CC-BY-NC-4.0", openOnly)).toMatchObject({ ok: false, message: expect.stringMatching(/only open source licences/) });
    expect(checkLicence("BSD-3-Clause", openOnly)).toMatchObject({ ok: true });
    // OR: one open choice is enough; AND: every part must be open
    expect(checkLicence("CC-BY-4.0 OR MIT", openOnly)).toMatchObject({ ok: true });
    expect(checkLicence("CC-BY-4.0 AND MIT", openOnly)).toMatchObject({ ok: false });
    expect(checkLicence("CERN-OHL-P-2.0", openOnly)).toMatchObject({ ok: true, open: true });
  });
});
