import { describe, expect, it } from "vitest";
import { DEMO_RULESET } from "~/rules/ruleset";
import { isDue, transitionProblem } from "./lifecycle";

const now = new Date("2027-03-01T12:00:00Z");
const later = new Date("2027-03-28T18:00:00Z");

describe("lifecycle guards", () => {
  it("opens only with a valid ruleset and a future deadline", () => {
    expect(transitionProblem({ state: "draft", deadlineAt: later, ruleset: DEMO_RULESET }, "open", now)).toBeNull();
    expect(transitionProblem({ state: "draft", deadlineAt: later, ruleset: { topModule: "top", pins: [{ name: "clk", direction: "input", width: 1, role: "clock" }] } }, "open", now)).toBeNull();
    expect(transitionProblem({ state: "draft", deadlineAt: later, ruleset: null }, "open", now)).toMatch(/ruleset/);
    expect(transitionProblem({ state: "draft", deadlineAt: later, ruleset: { topModule: "top", pins: [] } }, "open", now)).toMatch(/not valid: pins/);
    expect(transitionProblem({ state: "draft", deadlineAt: null, ruleset: DEMO_RULESET }, "open", now)).toMatch(/deadline/);
    expect(transitionProblem({ state: "draft", deadlineAt: now, ruleset: DEMO_RULESET }, "open", now)).toMatch(/passed/);
  });

  it("allows only the listed moves", () => {
    const c = { deadlineAt: later, ruleset: DEMO_RULESET };
    expect(transitionProblem({ ...c, state: "draft" }, "judging", now)).toMatch(/cannot move/);
    expect(transitionProblem({ ...c, state: "open" }, "closed", now)).toBeNull();
    expect(transitionProblem({ ...c, state: "closed" }, "judging", now)).toBeNull();
    expect(transitionProblem({ ...c, state: "judging" }, "results", now)).toBeNull();
    expect(transitionProblem({ ...c, state: "results" }, "judging", now)).toMatch(/cannot move/);
    expect(transitionProblem({ ...c, state: "judging" }, "open", now)).toMatch(/cannot move/);
  });

  it("is due exactly from the deadline on", () => {
    const d = new Date("2027-03-28T18:00:00Z");
    expect(isDue({ state: "open", deadlineAt: d }, new Date(d.getTime() - 1))).toBe(false);
    expect(isDue({ state: "open", deadlineAt: d }, d)).toBe(true);
    expect(isDue({ state: "open", deadlineAt: d }, new Date(d.getTime() + 1))).toBe(true);
    expect(isDue({ state: "draft", deadlineAt: d }, new Date(d.getTime() + 1))).toBe(false);
  });
});
