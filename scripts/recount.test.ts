import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, describe, expect, it } from "vitest";
import { runRecount } from "./recount";

const dir = mkdtempSync(join(tmpdir(), "gatecrash-recount-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function file(name: string, content: unknown): string {
  const path = join(dir, name);
  writeFileSync(path, typeof content === "string" ? content : JSON.stringify(content));
  return path;
}

// The Tennessee example from the Wikipedia article "Borda count" (published totals: Nashville 194,
// Chattanooga 173, Memphis 126, Knoxville 107), shrunk to its four voter groups repeated by share.
function tennessee() {
  const groups: [number, string[]][] = [
    [42, ["Memphis", "Nashville", "Chattanooga", "Knoxville"]],
    [26, ["Nashville", "Chattanooga", "Knoxville", "Memphis"]],
    [15, ["Chattanooga", "Knoxville", "Nashville", "Memphis"]],
    [17, ["Knoxville", "Chattanooga", "Nashville", "Memphis"]],
  ];
  return { method: "borda", ballots: groups.flatMap(([n, ranking]) => Array.from({ length: n }, () => ({ ranking }))) };
}

describe("runRecount", () => {
  it("prints the ranking as JSON and exits 0", () => {
    const result = runRecount([file("borda.json", tennessee())]);
    expect(result.code).toBe(0);
    const out = JSON.parse(result.stdout);
    expect(out.ranking.map((r: { candidate: string; score: number; place: number }) => [r.candidate, r.score, r.place])).toEqual([
      ["Nashville", 194, 1],
      ["Chattanooga", 173, 2],
      ["Memphis", 126, 3],
      ["Knoxville", 107, 4],
    ]);
    expect(out.details.entries).toHaveLength(4);
  });

  it("exits 2 with usage when no file is given", () => {
    const result = runRecount([]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/usage: recount FILE/);
  });

  it("exits 2 on a missing file, bad JSON and an invalid recount file", () => {
    const missing = runRecount([join(dir, "nope.json")]);
    expect([missing.code, missing.stderr]).toEqual([2, expect.stringMatching(/cannot read .*ENOENT/)]);

    const broken = runRecount([file("broken.json", '{"method": "points", ')]);
    expect([broken.code, broken.stderr]).toEqual([2, expect.stringMatching(/not valid JSON/)]);

    const invalid = runRecount([file("invalid.json", { method: "points", ballots: [{ ranking: ["a"] }] })]);
    expect(invalid.code).toBe(2);
    expect(invalid.stderr).toMatch(/not a valid recount file/);
    expect(invalid.stdout).toBe("");
  });

  it("exits 2 when the scores cannot be counted", () => {
    const result = runRecount([
      file("jury.json", {
        method: "jury-raw",
        criteria: [{ id: "design", weight: 1, max: 10 }],
        scores: [{ judge: "j", candidate: "A", criterion: "design", value: 12 }],
      }),
    ]);
    expect(result.code).toBe(2);
    expect(result.stderr).toMatch(/value 12 is outside −∞\.\.10/);
  });

  it("warns on stderr about set-aside ballots but still counts the rest", () => {
    const result = runRecount([file("pts.json", { method: "points", candidates: ["a"], ballots: [{ points: { a: 4 } }, { points: { b: 1 } }] })]);
    expect(result.code).toBe(0);
    expect(result.stderr).toMatch(/warning: ballot 2 set aside: "b" is not an entry/);
    expect(JSON.parse(result.stdout).ranking).toEqual([{ candidate: "a", score: 4, place: 1, tied: false }]);
  });
});

describe("npx tsx scripts/recount.ts FILE, end to end", () => {
  const tsx = fileURLToPath(new URL("../node_modules/tsx/dist/cli.mjs", import.meta.url));
  const script = fileURLToPath(new URL("./recount.ts", import.meta.url));
  const run = (path: string) => spawnSync(process.execPath, [tsx, script, path], { encoding: "utf8" });

  it("exits 0 and prints the Schulze ranking of the 45-voter example", () => {
    // Wikipedia "Schulze method", section "Example": published order E > A > C > B > D.
    const groups: [number, string][] = [
      [5, "ACBED"], [5, "ADECB"], [8, "BEDAC"], [3, "CABED"], [7, "CAEBD"], [2, "CBADE"], [7, "DCEBA"], [8, "EBADC"],
    ];
    const ballots = groups.flatMap(([n, order]) => Array.from({ length: n }, () => ({ ranking: order.split("") })));
    const child = run(file("schulze.json", { method: "schulze", ballots }));
    expect(child.status).toBe(0);
    expect(JSON.parse(child.stdout).ranking.map((r: { candidate: string }) => r.candidate).join("")).toBe("EACBD");
  });

  it("exits 2 on an invalid file, with the reason on stderr", () => {
    const child = run(file("bad-method.json", { method: "coin-toss" }));
    expect(child.status).toBe(2);
    expect(child.stdout).toBe("");
    expect(child.stderr).toMatch(/method must be one of/);
  });
});
