import { describe, expect, it } from "vitest";
import { crewFormSchema, leaveDecision } from "./rules";

describe("crew handle", () => {
  it("normalises and validates", () => {
    expect(crewFormSchema.parse({ handle: " Beam-Chasers ", name: "Beam Chasers" }).handle).toBe("beam-chasers");
    expect(crewFormSchema.safeParse({ handle: "-x-", name: "n" }).success).toBe(false);
    expect(crewFormSchema.safeParse({ handle: "a", name: "n" }).success).toBe(false);
    expect(crewFormSchema.safeParse({ handle: "ok", name: " " }).success).toBe(false);
  });
});

describe("leaving a crew", () => {
  it("lets members and non-last captains leave", () => {
    expect(leaveDecision({ role: "member", captains: 1, members: 3, entries: 2 })).toEqual({ ok: true, deletesCrew: false });
    expect(leaveDecision({ role: "captain", captains: 2, members: 3, entries: 2 })).toEqual({ ok: true, deletesCrew: false });
  });
  it("makes the last captain hand over first", () => {
    expect(leaveDecision({ role: "captain", captains: 1, members: 2, entries: 0 }).ok).toBe(false);
  });
  it("lets a lone member leave (deleting the crew) only without entries", () => {
    expect(leaveDecision({ role: "captain", captains: 1, members: 1, entries: 0 })).toEqual({ ok: true, deletesCrew: true });
    expect(leaveDecision({ role: "captain", captains: 1, members: 1, entries: 1 }).ok).toBe(false);
  });
});
