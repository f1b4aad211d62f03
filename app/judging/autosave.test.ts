import { describe, expect, it } from "vitest";
import { Autosave, OFFLINE_MESSAGE, type SaveRequest } from "./autosave";

/**
 * The autosave state machine against scripted server answers. The answers follow the judging API's contract
 * (DEVELOPERS.md: `{saved}` on success, `{error, current}` on a 409) and HTTP's meaning of the statuses:
 * 409 Conflict (RFC 9110, section 15.5.10), 423 Locked (RFC 4918, section 11.3), 5xx server errors (RFC 9110,
 * section 15.6). Timers are a queue the test runs by hand: nothing here waits on the clock.
 */
type Sent = { key: string; value: unknown; version: number };

function harness<T>(field: "value" | "note", empty: T) {
  const sent: Sent[] = [];
  const answers: (Response | "drop" | Promise<Response>)[] = [];
  const timers: { run: () => void; ms: number }[] = [];
  let changes = 0;
  let locked = false;
  const request: SaveRequest<T> = async (key, value, version) => {
    sent.push({ key, value, version });
    const a = answers.shift();
    if (a === undefined) throw new Error("no scripted answer");
    if (a === "drop") throw new TypeError("Failed to fetch");
    return a;
  };
  const save = new Autosave<T>({
    request,
    field,
    empty,
    onChange: () => void changes++,
    onLocked: () => void (locked = true),
    schedule: (run, ms) => timers.push({ run, ms }),
    cancel: () => {},
  });
  return { save, sent, answers, timers, changes: () => changes, locked: () => locked };
}

const json = (status: number, body: unknown) => new Response(JSON.stringify(body), { status, headers: { "content-type": "application/json" } });
const settle = () => new Promise<void>((r) => setImmediate(r));

describe("autosave of a score cell", () => {
  it("sends an edit with the version it saw and takes the server's new version", async () => {
    const h = harness<number | null>("value", null);
    h.save.add("e|c", null, 0);
    h.answers.push(json(200, { saved: { value: 7, version: 1 } }));
    h.save.edit("e|c", 7);
    expect(h.save.get("e|c")?.status).toBe("saving");
    await settle();
    expect(h.sent).toEqual([{ key: "e|c", value: 7, version: 0 }]);
    expect(h.save.get("e|c")).toMatchObject({ value: 7, saved: 7, version: 1, status: "saved" });
    expect(h.save.pending()).toBe(0);
  });

  it("going back to the confirmed value needs no request", () => {
    const h = harness<number | null>("value", null);
    h.save.add("e|c", 4, 2);
    h.save.edit("e|c", 4);
    expect(h.sent).toHaveLength(0);
    expect(h.save.get("e|c")?.status).toBe("saved");
  });

  it("keeps a value through a dropped connection and a 5xx, retrying after 1 s then 2 s, and saves it in the end", async () => {
    const h = harness<number | null>("value", null);
    h.save.add("e|c", null, 0);
    h.answers.push("drop", json(503, { error: { status: 503, code: "database_busy", message: "busy" } }), json(200, { saved: { value: 5, version: 1 } }));
    h.save.edit("e|c", 5);
    await settle();
    expect(h.save.get("e|c")).toMatchObject({ value: 5, status: "unsaved", message: OFFLINE_MESSAGE });
    expect(h.save.pending()).toBe(1);
    expect(h.timers.map((t) => t.ms)).toEqual([1000]);
    h.timers.shift()!.run();
    await settle();
    expect(h.timers.map((t) => t.ms)).toEqual([2000]);
    h.timers.shift()!.run();
    await settle();
    expect(h.sent.map((s) => s.value)).toEqual([5, 5, 5]);
    expect(h.save.get("e|c")).toMatchObject({ status: "saved", version: 1, message: undefined, attempts: 0 });
  });

  it("retries every waiting slot at once when the browser is back online", async () => {
    const h = harness<number | null>("value", null);
    h.save.add("a|c", null, 0);
    h.save.add("b|c", null, 0);
    h.answers.push("drop", "drop");
    h.save.edit("a|c", 1);
    h.save.edit("b|c", 2);
    await settle();
    expect(h.save.count("unsaved")).toBe(2);
    h.answers.push(json(200, { saved: { value: 1, version: 1 } }), json(200, { saved: { value: 2, version: 1 } }));
    h.save.retryUnsaved();
    await settle();
    expect(h.save.count("saved")).toBe(2);
  });

  it("never has two saves of a slot in flight: a value typed meanwhile goes out when the first save answers", async () => {
    const h = harness<number | null>("value", null);
    h.save.add("e|c", null, 0);
    let answerFirst!: (r: Response) => void;
    h.answers.push(new Promise<Response>((r) => (answerFirst = r)), json(200, { saved: { value: 9, version: 2 } }));
    h.save.edit("e|c", 3);
    await settle();
    h.save.edit("e|c", 9);
    await settle();
    expect(h.sent).toHaveLength(1);
    answerFirst(json(200, { saved: { value: 3, version: 1 } }));
    await settle();
    await settle();
    expect(h.sent).toEqual([
      { key: "e|c", value: 3, version: 0 },
      { key: "e|c", value: 9, version: 1 },
    ]);
    expect(h.save.get("e|c")).toMatchObject({ value: 9, saved: 9, version: 2, status: "saved" });
  });

  it("on a 409 shows the other value; keeping mine saves over their version, taking theirs needs no request", async () => {
    const h = harness<number | null>("value", null);
    h.save.add("e|c", 2, 1);
    h.answers.push(json(409, { error: { status: 409, code: "stale_version", message: "changed elsewhere" }, current: { value: 8, version: 2 } }));
    h.save.edit("e|c", 6);
    await settle();
    expect(h.save.get("e|c")).toMatchObject({ status: "conflict", value: 6, theirs: { value: 8, version: 2 }, message: "changed elsewhere" });
    h.answers.push(json(200, { saved: { value: 6, version: 3 } }));
    await h.save.keepMine("e|c");
    expect(h.sent[1]).toEqual({ key: "e|c", value: 6, version: 2 });
    expect(h.save.get("e|c")).toMatchObject({ status: "saved", version: 3 });

    h.answers.push(json(409, { error: { status: 409, code: "stale_version", message: "changed elsewhere" }, current: { value: null, version: 4 } }));
    h.save.edit("e|c", 1);
    await settle();
    h.save.takeTheirs("e|c");
    expect(h.sent).toHaveLength(3);
    expect(h.save.get("e|c")).toMatchObject({ status: "saved", value: null, saved: null, version: 4, theirs: undefined });
  });

  it("marks a refused value failed with the field's reason, and a 423 locks the grid", async () => {
    const h = harness<number | null>("value", null);
    h.save.add("e|c", null, 0);
    h.answers.push(json(400, { error: { status: 400, code: "invalid_body", message: "Some fields are not valid.", fieldErrors: { value: ["At most 10."] } } }));
    h.save.edit("e|c", 11);
    await settle();
    expect(h.save.get("e|c")).toMatchObject({ status: "failed", message: "At most 10." });
    expect(h.locked()).toBe(false);
    h.answers.push(json(423, { error: { status: 423, code: "judging_closed", message: "Judging of this compo is closed." } }));
    h.save.edit("e|c", 3);
    await settle();
    expect(h.save.get("e|c")).toMatchObject({ status: "failed", message: "Judging of this compo is closed." });
    expect(h.locked()).toBe(true);
    expect(h.timers).toHaveLength(0);
  });
});

describe("autosave of a note (the same machine, on the note member)", () => {
  it("saves, and takes the other tab's note after a 409", async () => {
    const h = harness<string>("note", "");
    h.save.add("e", "", 0);
    h.answers.push(json(200, { saved: { note: "warm colours", version: 1 } }));
    h.save.edit("e", "warm colours");
    await settle();
    expect(h.save.get("e")).toMatchObject({ status: "saved", saved: "warm colours", version: 1 });
    h.answers.push(json(409, { error: { status: 409, code: "stale_version", message: "changed elsewhere" }, current: { note: "cold", version: 2 } }));
    h.save.edit("e", "warmer");
    await settle();
    expect(h.save.get("e")?.theirs).toEqual({ value: "cold", version: 2 });
    h.save.takeTheirs("e");
    expect(h.save.get("e")).toMatchObject({ status: "saved", value: "cold" });
  });

  it("names a refused note by the note field's reason", async () => {
    const h = harness<string>("note", "");
    h.save.add("e", "", 0);
    h.answers.push(json(400, { error: { status: 400, code: "invalid_body", message: "Some fields are not valid.", fieldErrors: { note: ["At most 2000 characters."] } } }));
    h.save.edit("e", "x");
    await settle();
    expect(h.save.get("e")).toMatchObject({ status: "failed", message: "At most 2000 characters." });
  });
});
