// @vitest-environment happy-dom
import { act, cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { createRoutesStub } from "react-router";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import type { GridData } from "~/judging/types";
import { ScoringGrid } from "./ScoringGrid";

/**
 * The scoring grid in a DOM (happy-dom) with React Testing Library. The keyboard checks follow the WAI-ARIA
 * Authoring Practices' grid pattern (APG "Grid (Interactive Tabular Data and Layout Containers)", keyboard
 * interaction: arrow keys move between cells, one cell is in the tab sequence); the save traffic is the judging API
 * (`POST /api/judging/:id/scores` and `/notes`, DEVELOPERS.md), answered by a scripted fetch.
 */
const COMPO = "9b2f7e0c-1d4a-4c8e-9f3b-6a5d2c1e0f11";
const data: GridData = {
  criteria: [
    { id: "c-look", name: "Looks", weight: 2, scaleMin: 0, scaleMax: 10 },
    { id: "c-sound", name: "Sound", weight: 1, scaleMin: 0, scaleMax: 10 },
  ],
  rows: [
    { entryId: "e-bus", title: "Night Bus", crew: null, position: 1, cells: {}, note: "", noteVersion: 0 },
    { entryId: "e-moth", title: "Moth Light", crew: null, position: 2, cells: { "c-look": { value: 6, version: 3 } }, note: "", noteVersion: 0 },
  ],
  conflicted: 0,
  withoutUpload: 0,
  scored: 0,
};

type Answer = { status: number; body: unknown } | "drop";
let answers: Answer[];
let posted: { url: string; body: Record<string, unknown> }[];

beforeEach(() => {
  answers = [];
  posted = [];
  vi.stubGlobal("fetch", async (url: string, init: RequestInit) => {
    posted.push({ url, body: JSON.parse(String(init.body)) });
    const a = answers.shift();
    if (!a || a === "drop") throw new TypeError("Failed to fetch");
    return new Response(JSON.stringify(a.body), { status: a.status, headers: { "content-type": "application/json" } });
  });
});
afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

function renderGrid(locked = false) {
  const Stub = createRoutesStub([{ path: "/judging/:id", Component: () => <ScoringGrid competitionId={COMPO} data={data} locked={locked} /> }]);
  return render(<Stub initialEntries={[`/judging/${COMPO}`]} />);
}

const cell = (row: number, col: number) => document.querySelector<HTMLElement>(`[data-cell="${row}:${col}"]`)!;
const flush = () => act(async () => void (await new Promise((r) => setTimeout(r, 0))));

async function typeScore(row: number, col: number, text: string, commitKey = "Enter") {
  const c = cell(row, col);
  act(() => c.focus());
  fireEvent.keyDown(c, { key: text[0] });
  const input = within(c).getByRole("textbox");
  fireEvent.change(input, { target: { value: text } });
  fireEvent.keyDown(input, { key: commitKey });
  await flush();
}

describe("the scoring grid", () => {
  it("shows one row per entry with its scores and the progress line", () => {
    renderGrid();
    const grid = screen.getByRole("grid", { name: "Scoring grid" });
    expect(within(grid).getAllByRole("row")).toHaveLength(3); // the header and two entries
    expect(screen.getByTestId("progress").textContent).toBe("0 of 2 entries scored");
    expect(cell(1, 2).getAttribute("aria-label")).toBe("Moth Light, Looks: 6, saved");
    // One cell is in the tab sequence (a roving tabindex), the first score of the first row.
    expect(document.querySelectorAll('[role="gridcell"][tabindex="0"]')).toHaveLength(1);
    expect(cell(0, 2).tabIndex).toBe(0);
  });

  it("moves between cells with the arrow keys", () => {
    renderGrid();
    act(() => cell(0, 2).focus());
    fireEvent.keyDown(cell(0, 2), { key: "ArrowRight" });
    expect(document.activeElement).toBe(cell(0, 3));
    fireEvent.keyDown(cell(0, 3), { key: "ArrowDown" });
    expect(document.activeElement).toBe(cell(1, 3));
    expect(cell(1, 3).tabIndex).toBe(0);
    expect(cell(0, 2).tabIndex).toBe(-1);
  });

  it("saves a typed score with the version it was loaded at, marks it saved and moves down", async () => {
    renderGrid();
    answers.push({ status: 200, body: { saved: { value: 8, version: 4 } } });
    await typeScore(1, 2, "8");
    expect(posted).toEqual([{ url: `/api/judging/${COMPO}/scores`, body: { entryId: "e-moth", criterionId: "c-look", value: 8, version: 3 } }]);
    expect(cell(1, 2).dataset.status).toBe("saved");
    expect(cell(1, 2).getAttribute("aria-label")).toBe("Moth Light, Looks: 8, saved");
    expect(screen.getByTestId("save-status").textContent).toBe("All changes saved");
  });

  it("refuses a score off the scale before sending it", async () => {
    renderGrid();
    await typeScore(0, 2, "11");
    expect(posted).toHaveLength(0);
    expect(within(cell(0, 2)).getByRole("alert").textContent).toBe("A score must be between 0 and 10.");
  });

  it("keeps a score through a dropped connection and says so", async () => {
    renderGrid();
    answers.push("drop");
    await typeScore(0, 2, "5");
    expect(cell(0, 2).dataset.status).toBe("unsaved");
    expect(screen.getByTestId("save-status").textContent).toMatch(/1 change not saved yet/);
  });

  it("shows a score saved in another tab and takes it on request, without another request", async () => {
    renderGrid();
    answers.push({ status: 409, body: { error: { status: 409, code: "stale_version", message: "changed elsewhere" }, current: { value: 9, version: 5 } } });
    await typeScore(1, 2, "4");
    const alert = screen.getByTestId("conflicts");
    expect(alert.textContent).toMatch(/Moth Light · Looks was saved elsewhere as 9; yours is 4/);
    fireEvent.click(within(alert).getByRole("button", { name: "Take 9" }));
    expect(screen.queryByTestId("conflicts")).toBeNull();
    expect(cell(1, 2).getAttribute("aria-label")).toBe("Moth Light, Looks: 9, saved");
    expect(posted).toHaveLength(1);
  });

  it("keeps mine after a conflict by saving over the other tab's version", async () => {
    renderGrid();
    answers.push({ status: 409, body: { error: { status: 409, code: "stale_version", message: "changed elsewhere" }, current: { value: 9, version: 5 } } });
    await typeScore(1, 2, "4");
    answers.push({ status: 200, body: { saved: { value: 4, version: 6 } } });
    fireEvent.click(within(screen.getByTestId("conflicts")).getByRole("button", { name: "Keep mine" }));
    await flush();
    expect(posted[1].body).toEqual({ entryId: "e-moth", criterionId: "c-look", value: 4, version: 5 });
    expect(cell(1, 2).dataset.status).toBe("saved");
  });

  it("turns read-only with a banner once the server says judging is closed", async () => {
    renderGrid();
    answers.push({ status: 423, body: { error: { status: 423, code: "judging_closed", message: "Judging of this compo is closed: scores can no longer change." } } });
    await typeScore(0, 2, "3");
    expect(screen.getByTestId("locked-banner")).toBeTruthy();
    expect(cell(0, 2).dataset.status).toBe("failed");
    // A digit no longer opens the editor.
    fireEvent.keyDown(cell(0, 3), { key: "7" });
    expect(within(cell(0, 3)).queryByRole("textbox")).toBeNull();
  });

  it("saves a note through the notes API", async () => {
    renderGrid();
    answers.push({ status: 200, body: { saved: { note: "warm palette", version: 1 } } });
    const noteCell = cell(0, 5);
    act(() => noteCell.focus());
    fireEvent.keyDown(noteCell, { key: "Enter" });
    const input = within(noteCell).getByRole("textbox", { name: "Note on Night Bus" });
    fireEvent.change(input, { target: { value: "warm palette" } });
    fireEvent.keyDown(input, { key: "Enter" });
    await flush();
    expect(posted).toEqual([{ url: `/api/judging/${COMPO}/notes`, body: { entryId: "e-bus", note: "warm palette", version: 0 } }]);
    expect(noteCell.dataset.status).toBe("saved");
  });
});
