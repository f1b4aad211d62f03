import { createSortedRowModel, rowSortingFeature, sortFn_alphanumeric, tableFeatures, useTable, type ColumnDef, type SortingState } from "@tanstack/react-table";
import { useCallback, useEffect, useMemo, useReducer, useRef, useState, type KeyboardEvent } from "react";
import { Link } from "react-router";
import { moveCell, type GridMove, type Pos } from "~/judging/grid-keys";
import { Autosave } from "~/judging/autosave";
import { isFullyScored, parseTypedScore, scaleError, weightedTotal, type ScaleCriterion } from "~/judging/sheet";
import type { GridData, GridRow } from "~/judging/types";
import { ScoringMark } from "./ScoringMark";

/**
 * The judge's scoring grid: one TanStack table, keyboard first, every cell autosaved on its own.
 *
 * Keys on a cell: arrows/Home/End move; a digit starts typing a score; Enter or F2 edits (Enter on the entry
 * opens it); Delete clears a score. While typing: Enter commits and moves down, Tab/Shift+Tab commit and move
 * to the next/previous score (wrapping rows), Escape reverts. Tab outside typing leaves the grid.
 *
 * Saving: each change is POSTed with the version the tab last saw. Network failures and 5xx keep the value
 * as "unsaved" and retry with back-off (and at once when the browser comes back online); a 409 shows the
 * other tab's value and lets the judge keep theirs or take it; a 400/403/423 marks the cell failed with the reason.
 * Cells and notes go through the same state machine (app/judging/autosave.ts, tested there).
 */
type LiveRow = GridRow & { live: Record<string, number | null>; total: number | null };

const features = tableFeatures({ rowSortingFeature, sortedRowModel: createSortedRowModel(), sortFns: { alphanumeric: sortFn_alphanumeric } });

const key = (entryId: string, criterionId: string) => `${entryId}|${criterionId}`;

export function ScoringGrid({ competitionId, data, locked: lockedAtLoad }: { competitionId: string; data: GridData; locked: boolean }) {
  const { criteria } = data;
  const [, rerender] = useReducer((x: number) => x + 1, 0);
  const [locked, setLocked] = useState(lockedAtLoad);

  // Live cell and note state lives in two autosave machines (app/judging/autosave.ts); `rerender` paints them.
  const saver = useRef<{ cells: Autosave<number | null>; notes: Autosave<string> } | null>(null);
  if (!saver.current) {
    const post = (path: "scores" | "notes", body: unknown) =>
      fetch(`/api/judging/${competitionId}/${path}`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
    const common = { onChange: rerender, onLocked: () => setLocked(true) };
    const cellSaver = new Autosave<number | null>({
      ...common,
      field: "value",
      empty: null,
      request: (k, value, version) => {
        const [entryId, criterionId] = k.split("|");
        return post("scores", { entryId, criterionId, value, version });
      },
    });
    const noteSaver = new Autosave<string>({ ...common, field: "note", empty: "", request: (entryId, note, version) => post("notes", { entryId, note, version }) });
    for (const r of data.rows) {
      for (const c of criteria) {
        const cell = r.cells[c.id] ?? { value: null, version: 0 };
        cellSaver.add(key(r.entryId, c.id), cell.value, cell.version);
      }
      noteSaver.add(r.entryId, r.note, r.noteVersion);
    }
    saver.current = { cells: cellSaver, notes: noteSaver };
  }
  const { cells, notes } = saver.current;

  const liveValues = useCallback(
    (entryId: string) => Object.fromEntries(criteria.map((c) => [c.id, cells.get(key(entryId, c.id))?.value ?? null])),
    [criteria, cells],
  );

  useEffect(() => {
    const retryAll = () => {
      cells.retryUnsaved();
      notes.retryUnsaved();
    };
    const onUnload = (e: BeforeUnloadEvent) => {
      if (cells.pending() + notes.pending() > 0) e.preventDefault();
    };
    window.addEventListener("online", retryAll);
    window.addEventListener("beforeunload", onUnload);
    return () => {
      window.removeEventListener("online", retryAll);
      window.removeEventListener("beforeunload", onUnload);
      cells.dispose();
      notes.dispose();
    };
  }, [cells, notes]);

  const setScore = (entryId: string, criterionId: string, value: number | null) => cells.edit(key(entryId, criterionId), value);
  const setNote = (entryId: string, note: string) => notes.edit(entryId, note);

  // ---------- the table ----------
  const [sorting, setSorting] = useState<SortingState>([]);
  const [onlyUnscored, setOnlyUnscored] = useState<Set<string> | null>(null);
  const [epoch, bumpEpoch] = useReducer((x: number) => x + 1, 0);

  // Rows are rebuilt (with the live values the sort reads) only when the sort or the filter changes, so a row
  // never jumps away while the judge is typing in it.
  const rows: LiveRow[] = useMemo(() => {
    void epoch;
    return data.rows
      .filter((r) => !onlyUnscored || onlyUnscored.has(r.entryId))
      .map((r) => {
        const live = liveValues(r.entryId);
        return { ...r, live, total: weightedTotal(criteria, live) };
      });
  }, [data.rows, onlyUnscored, epoch, liveValues, criteria]);

  const columns = useMemo<ColumnDef<typeof features, LiveRow>[]>(
    () => [
      { id: "position", header: "#", accessorFn: (r) => r.position, sortUndefined: "last" },
      { id: "entry", header: "Entry", accessorFn: (r) => r.title.toLowerCase(), sortFn: "alphanumeric" },
      ...criteria.map(
        (c): ColumnDef<typeof features, LiveRow> => ({ id: `c:${c.id}`, header: c.name, accessorFn: (r) => r.live[c.id] ?? undefined, sortUndefined: "last" }),
      ),
      { id: "total", header: "Your total", accessorFn: (r) => r.total ?? undefined, sortUndefined: "last" },
      { id: "note", header: "Note", accessorFn: (r) => notes.get(r.entryId)?.value ?? "", enableSorting: false },
    ],
    [criteria, notes],
  );

  const table = useTable({
    features,
    columns,
    data: rows,
    getRowId: (r) => r.entryId,
    state: { sorting },
    onSortingChange: (updater) => {
      setSorting(updater);
      bumpEpoch();
    },
  });
  const visibleRows = table.getRowModel().rows;

  // ---------- focus and keys ----------
  const firstScoreCol = 2;
  const lastScoreCol = 1 + criteria.length;
  const colCount = criteria.length + 4;
  const [active, setActive] = useState<Pos>({ row: 0, col: firstScoreCol });
  const [editing, setEditingState] = useState<{ row: number; col: number; text: string; error?: string } | null>(null);
  // The ref is what commits read: a blur that follows Enter/Tab/Escape finds it empty and does nothing.
  const editingRef = useRef<typeof editing>(null);
  const setEditing = (next: typeof editing) => {
    editingRef.current = next;
    setEditingState(next);
  };
  const cellRefs = useRef(new Map<string, HTMLElement>());
  const wantFocus = useRef(false);

  useEffect(() => {
    if (!wantFocus.current || editing) return;
    cellRefs.current.get(`${active.row}:${active.col}`)?.focus();
  }, [active, editing]);

  const go = (move: GridMove, from: Pos = active): boolean => {
    const next = moveCell(from, move, visibleRows.length, colCount, firstScoreCol, lastScoreCol);
    if (!next) return false;
    wantFocus.current = true;
    setActive(next);
    return true;
  };

  const criterionAt = (col: number): ScaleCriterion | null => (col >= firstScoreCol && col <= lastScoreCol ? criteria[col - firstScoreCol] : null);
  const noteCol = colCount - 1;

  const commitEdit = (then: GridMove | null) => {
    const editing = editingRef.current;
    if (!editing) return;
    const row = visibleRows[editing.row]?.original;
    if (!row) return setEditing(null);
    const crit = criterionAt(editing.col);
    if (crit) {
      const parsed = parseTypedScore(editing.text);
      if ("error" in parsed) return setEditing({ ...editing, error: parsed.error });
      if (parsed.value !== null) {
        const problem = scaleError(crit, parsed.value);
        if (problem) return setEditing({ ...editing, error: problem });
      }
      setScore(row.entryId, crit.id, parsed.value);
    } else if (editing.col === noteCol) {
      setNote(row.entryId, editing.text);
    }
    const from = { row: editing.row, col: editing.col };
    setEditing(null);
    wantFocus.current = true;
    if (then) {
      if (!go(then, from)) setActive(from);
    } else setActive(from);
  };

  const startEdit = (pos: Pos, text?: string) => {
    if (locked) return;
    const row = visibleRows[pos.row]?.original;
    if (!row) return;
    const crit = criterionAt(pos.col);
    if (crit) {
      const v = cells.get(key(row.entryId, crit.id))?.value;
      setEditing({ ...pos, text: text ?? (v === null || v === undefined ? "" : String(v)) });
    } else if (pos.col === noteCol) {
      setEditing({ ...pos, text: text ?? notes.get(row.entryId)?.value ?? "" });
    }
  };

  const onCellKey = (e: KeyboardEvent<HTMLElement>, pos: Pos) => {
    const moves: Record<string, GridMove> = { ArrowUp: "up", ArrowDown: "down", ArrowLeft: "left", ArrowRight: "right", Home: "home", End: "end" };
    if (moves[e.key]) {
      e.preventDefault();
      go(moves[e.key], pos);
      return;
    }
    const row = visibleRows[pos.row]?.original;
    const crit = criterionAt(pos.col);
    if (crit && /^[0-9.,]$/.test(e.key) && !e.ctrlKey && !e.metaKey && !e.altKey) {
      e.preventDefault();
      startEdit(pos, e.key);
    } else if (e.key === "Enter" || e.key === "F2") {
      if (pos.col === 1 && row) return; // the entry link handles Enter itself
      e.preventDefault();
      startEdit(pos);
    } else if ((e.key === "Delete" || e.key === "Backspace") && crit && row && !locked) {
      e.preventDefault();
      setScore(row.entryId, crit.id, null);
    }
  };

  const onEditKey = (e: KeyboardEvent<HTMLInputElement>) => {
    if (e.key === "Enter") {
      e.preventDefault();
      commitEdit("down");
    } else if (e.key === "Tab") {
      e.preventDefault();
      commitEdit(e.shiftKey ? "prev" : "next");
    } else if (e.key === "Escape") {
      e.preventDefault();
      const current = editingRef.current;
      const from = current ? { row: current.row, col: current.col } : active;
      setEditing(null);
      wantFocus.current = true;
      setActive(from);
    }
  };

  // ---------- figures for the header ----------
  const scoredCount = data.rows.filter((r) => isFullyScored(criteria, liveValues(r.entryId))).length;
  const unsaved = cells.pending() + notes.pending();
  const failed = cells.count("failed") + notes.count("failed");
  const conflicted = data.rows.flatMap((r) =>
    criteria
      .map((c) => ({ r, c, st: cells.get(key(r.entryId, c.id))! }))
      .filter((x) => x.st.status === "conflict"),
  );
  const noteConflicts = data.rows.map((r) => ({ r, st: notes.get(r.entryId)! })).filter((x) => x.st.status === "conflict");

  const toggleUnscored = (on: boolean) => {
    setOnlyUnscored(on ? new Set(data.rows.filter((r) => !isFullyScored(criteria, liveValues(r.entryId))).map((r) => r.entryId)) : null);
    setActive({ row: 0, col: firstScoreCol });
  };

  const fmt = (v: number | null) => (v === null ? "" : Number.isInteger(v) ? String(v) : v.toFixed(1));

  return (
    <div>
      <div className="mb-4 flex flex-wrap items-center gap-4">
        <p className="text-lg font-semibold" data-testid="progress" aria-live="polite">
          {scoredCount} of {data.rows.length} entries scored
        </p>
        <progress className="h-2 w-48 accent-violet" max={Math.max(1, data.rows.length)} value={scoredCount} aria-label="Scoring progress" />
        <p className="text-sm" role="status" data-testid="save-status">
          {conflicted.length + noteConflicts.length > 0 ? (
            <span className="font-semibold text-warn">{conflicted.length + noteConflicts.length} change(s) need your decision — see above the grid</span>
          ) : unsaved > 0 ? (
            <span className="font-semibold text-warn">{unsaved} change{unsaved === 1 ? "" : "s"} not saved yet — kept here and retried</span>
          ) : failed > 0 ? (
            <span className="font-semibold text-fail">{failed} change{failed === 1 ? "" : "s"} refused — see the marked cells</span>
          ) : (
            <span className="text-pass">All changes saved</span>
          )}
        </p>
        <label className="ml-auto flex items-center gap-2 text-sm">
          <input type="checkbox" checked={onlyUnscored !== null} onChange={(e) => toggleUnscored(e.target.checked)} />
          Only entries I have not fully scored
        </label>
      </div>

      {locked && (
        <p role="status" className="mb-4 rounded-md border border-line bg-line/40 px-3 py-2 text-sm font-medium" data-testid="locked-banner">
          Judging of this compo is closed. Your scores are kept and shown read-only; only the organizers can reopen judging.
        </p>
      )}

      {(conflicted.length > 0 || noteConflicts.length > 0) && (
        <div role="alert" className="mb-4 space-y-2 rounded-md border border-warn bg-warn-soft px-3 py-2 text-sm" data-testid="conflicts">
          {conflicted.map(({ r, c, st }) => (
            <p key={key(r.entryId, c.id)}>
              <strong>{r.title} · {c.name}</strong> was saved elsewhere as <strong>{fmt(st.theirs?.value ?? null) || "empty"}</strong>; yours is{" "}
              <strong>{fmt(st.value) || "empty"}</strong>.{" "}
              <button type="button" className="btn-quiet px-2 py-0.5" onClick={() => void cells.keepMine(key(r.entryId, c.id))}>
                Keep mine
              </button>{" "}
              <button type="button" className="btn-quiet px-2 py-0.5" onClick={() => cells.takeTheirs(key(r.entryId, c.id))}>
                Take {fmt(st.theirs?.value ?? null) || "empty"}
              </button>
            </p>
          ))}
          {noteConflicts.map(({ r, st }) => (
            <p key={`note-${r.entryId}`}>
              <strong>Your note on {r.title}</strong> was changed elsewhere to “{st.theirs?.value}”.{" "}
              <button type="button" className="btn-quiet px-2 py-0.5" onClick={() => void notes.keepMine(r.entryId)}>
                Keep mine
              </button>{" "}
              <button type="button" className="btn-quiet px-2 py-0.5" onClick={() => notes.takeTheirs(r.entryId)}>
                Take theirs
              </button>
            </p>
          ))}
        </div>
      )}

      <div className="overflow-x-auto rounded-xl border border-line bg-card">
        <table role="grid" aria-label="Scoring grid" aria-rowcount={visibleRows.length + 1} aria-readonly={locked || undefined} className="w-full text-sm">
          <thead className="bg-paper">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  const crit = header.column.id.startsWith("c:") ? criteria.find((c) => `c:${c.id}` === header.column.id) : null;
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : "none"}
                      className="border-b border-line px-3 py-2 text-left align-bottom font-semibold text-ink-soft"
                    >
                      {header.column.getCanSort() ? (
                        <button type="button" onClick={header.column.getToggleSortingHandler()} className="inline-flex items-center gap-1 hover:text-ink">
                          <table.FlexRender header={header} />
                          <span aria-hidden="true">{sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}</span>
                        </button>
                      ) : (
                        <table.FlexRender header={header} />
                      )}
                      {crit && (
                        <span className="block text-xs font-normal text-mute">
                          {crit.scaleMin}–{crit.scaleMax} · weight {crit.weight}
                        </span>
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {visibleRows.length === 0 && (
              <tr>
                <td colSpan={colCount} className="px-3 py-6 text-center text-mute">
                  {onlyUnscored ? "Every entry is fully scored." : "No entries to judge yet."}
                </td>
              </tr>
            )}
            {visibleRows.map((row, ri) => {
              const r = row.original;
              const live = liveValues(r.entryId);
              const total = weightedTotal(criteria, live);
              const full = isFullyScored(criteria, live);
              return (
                <tr key={row.id} className="border-b border-line last:border-0" data-entry-id={r.entryId}>
                  {row.getAllCells().map((cell, ci) => {
                    const pos = { row: ri, col: ci };
                    const isActive = active.row === ri && active.col === ci;
                    const isEditing = editing?.row === ri && editing.col === ci;
                    const common = {
                      role: "gridcell",
                      tabIndex: isActive && !isEditing ? 0 : -1,
                      ref: (el: HTMLElement | null) => {
                        if (el) cellRefs.current.set(`${ri}:${ci}`, el);
                        else cellRefs.current.delete(`${ri}:${ci}`);
                      },
                      onFocus: () => {
                        if (!isActive) setActive(pos);
                        wantFocus.current = true;
                      },
                      onKeyDown: (e: KeyboardEvent<HTMLElement>) => {
                        if (e.target === e.currentTarget) onCellKey(e, pos);
                      },
                      "data-cell": `${ri}:${ci}`,
                    } as const;
                    const crit = criterionAt(ci);
                    if (ci === 0)
                      return (
                        <td key={cell.id} {...common} className="w-10 px-3 py-2 text-mute">
                          {r.position}
                        </td>
                      );
                    if (ci === 1)
                      return (
                        <td key={cell.id} role="gridcell" className="px-3 py-2">
                          <Link
                            to={`/judging/${competitionId}/entries/${r.entryId}`}
                            className="font-semibold text-ink underline-offset-2 hover:underline"
                            tabIndex={isActive ? 0 : -1}
                            data-cell={`${ri}:${ci}`}
                            onFocus={() => {
                              if (!isActive) setActive(pos);
                              wantFocus.current = true;
                            }}
                            onKeyDown={(e) => {
                              if (e.key !== "Enter") onCellKey(e, pos);
                            }}
                            ref={(el) => {
                              if (el) cellRefs.current.set(`${ri}:${ci}`, el);
                              else cellRefs.current.delete(`${ri}:${ci}`);
                            }}
                          >
                            {r.title}
                          </Link>
                          <span className="block text-xs text-mute">{r.crew ?? "crew hidden (blind judging)"}</span>
                        </td>
                      );
                    if (crit) {
                      const st = cells.get(key(r.entryId, crit.id))!;
                      const errId = `err-${r.entryId}-${crit.id}`;
                      return (
                        <td
                          key={cell.id}
                          {...common}
                          aria-label={`${r.title}, ${crit.name}: ${st.value === null ? "no score" : fmt(st.value)}, ${st.status}`}
                          aria-describedby={st.message || isEditing ? errId : undefined}
                          className={`relative w-24 px-2 py-1 ${isActive ? "bg-violet-soft" : ""} ${st.status === "failed" ? "outline outline-2 -outline-offset-2 outline-fail" : ""}`}
                          data-status={st.status}
                        >
                          {isEditing ? (
                            <input
                              autoFocus
                              inputMode="decimal"
                              aria-label={`${crit.name} for ${r.title}, ${crit.scaleMin} to ${crit.scaleMax}`}
                              aria-invalid={editing?.error ? true : undefined}
                              aria-describedby={errId}
                              value={editing!.text}
                              onChange={(e) => setEditing({ ...editing!, text: e.target.value, error: undefined })}
                              onKeyDown={onEditKey}
                              onBlur={() => commitEdit(null)}
                              className="w-16 rounded border border-violet bg-card px-1 py-0.5 text-right font-mono"
                            />
                          ) : (
                            <span className="flex items-center justify-end gap-1.5">
                              <span className="font-mono text-base">{fmt(st.value) || <span className="text-mute">–</span>}</span>
                              <ScoringMark status={st.status} />
                            </span>
                          )}
                          {(isEditing && editing?.error) || (st.message && st.status !== "conflict") ? (
                            <span id={errId} role={isEditing ? "alert" : undefined} className={`block max-w-40 text-xs font-medium ${st.status === "unsaved" && !isEditing ? "text-warn" : "text-fail"}`}>
                              {isEditing ? editing?.error : st.message}
                            </span>
                          ) : null}
                        </td>
                      );
                    }
                    if (ci === colCount - 2)
                      return (
                        <td key={cell.id} {...common} className="px-3 py-2 text-right font-mono" aria-label={`Your weighted total for ${r.title}: ${total === null ? "none yet" : total.toFixed(2)}${full || total === null ? "" : ", partial"}`}>
                          {total === null ? <span className="text-mute">–</span> : total.toFixed(2)}
                          {total !== null && !full && <span className="ml-1 text-xs text-warn">partial</span>}
                        </td>
                      );
                    const ns = notes.get(r.entryId)!;
                    return (
                      <td key={cell.id} {...common} className={`min-w-48 px-2 py-1 ${isActive ? "bg-violet-soft" : ""}`} data-status={ns.status}>
                        {isEditing ? (
                          <input
                            autoFocus
                            aria-label={`Note on ${r.title}`}
                            value={editing!.text}
                            maxLength={2000}
                            onChange={(e) => setEditing({ ...editing!, text: e.target.value })}
                            onKeyDown={onEditKey}
                            onBlur={() => commitEdit(null)}
                            className="w-full rounded border border-violet bg-card px-1 py-0.5"
                          />
                        ) : (
                          <span className="flex items-center gap-1.5">
                            <span className="truncate">{ns.value || <span className="text-mute">Enter to add a note</span>}</span>
                            <ScoringMark status={ns.status} />
                          </span>
                        )}
                        {ns.message && <span className="block text-xs font-medium text-fail">{ns.message}</span>}
                      </td>
                    );
                  })}
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      <p className="mt-3 text-xs text-mute">
        Keys: arrows move · type a digit to score · Enter or Tab saves (Tab goes on to the next score) · Escape undoes the typing · Delete clears a
        score · Enter on an entry opens it. Every cell saves by itself; a mark beside it says whether it is saved.
      </p>
    </div>
  );
}
