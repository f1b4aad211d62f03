import { getFormProps, getTextareaProps, useForm, type SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import {
  columnFilteringFeature,
  columnVisibilityFeature,
  createColumnHelper,
  createFilteredRowModel,
  createSortedRowModel,
  filterFn_equalsString,
  filterFn_includesString,
  FlexRender,
  globalFilteringFeature,
  rowSortingFeature,
  sortFn_alphanumeric,
  sortFn_basic,
  sortFn_datetime,
  tableFeatures,
  useTable,
} from "@tanstack/react-table";
import { Form } from "react-router";
import { disqualifySchema } from "../entries-forms";

/** The organizer's entries table: sort by any column header, filter by text and state, choose the columns. */
export interface EntryRowView {
  id: string;
  title: string;
  crewHandle: string;
  crewName: string;
  feeState: string;
  state: string;
  disqualifiedReason: string | null;
  uploadNumber: number | null;
  uploadAt: string | null;
  uploadLate: boolean;
  uploadAtLabel: string;
  verdict: string;
  files: { id: string; kind: string; filename: string; sizeBytes: number | null }[];
}

const features = tableFeatures({
  rowSortingFeature,
  columnFilteringFeature,
  globalFilteringFeature,
  columnVisibilityFeature,
  sortedRowModel: createSortedRowModel(),
  filteredRowModel: createFilteredRowModel(),
  sortFns: { alphanumeric: sortFn_alphanumeric, basic: sortFn_basic, datetime: sortFn_datetime },
  filterFns: { includesString: filterFn_includesString, equalsString: filterFn_equalsString },
});

const h = createColumnHelper<typeof features, EntryRowView>();

const VERDICT: Record<string, string> = {
  pass: "bg-pass-soft text-pass",
  warn: "bg-warn-soft text-warn",
  fail: "bg-fail-soft text-fail",
};

function fmtBytes(n: number | null): string {
  if (n == null) return "";
  if (n < 1024) return `${n} B`;
  if (n < 1024 * 1024) return `${(n / 1024).toFixed(1)} KiB`;
  return `${(n / 1024 / 1024).toFixed(1)} MiB`;
}

export function EntriesTable({
  rows,
  competitionId,
  lastResult,
  lastEntryId,
  busy,
}: {
  rows: EntryRowView[];
  competitionId: string;
  lastResult?: SubmissionResult<string[]>;
  lastEntryId?: string;
  busy: boolean;
}) {
  const columns = h.columns([
    h.accessor("crewHandle", { header: "Crew", sortFn: "alphanumeric", cell: (i) => <span className="font-semibold">{i.getValue()}</span> }),
    h.accessor("title", { header: "Title", sortFn: "alphanumeric" }),
    h.accessor("feeState", { header: "Fee", sortFn: "alphanumeric", cell: (i) => i.getValue().replace("_", " ") }),
    h.accessor("uploadNumber", {
      header: "Upload",
      sortFn: "basic",
      sortUndefined: "last",
      cell: (i) => (i.getValue() == null ? <span className="text-mute">none</span> : `#${i.getValue()}${i.row.original.uploadLate ? " (late)" : ""}`),
    }),
    h.accessor("uploadAt", { header: "Uploaded", sortFn: "alphanumeric", sortUndefined: "last", cell: (i) => i.row.original.uploadAtLabel }),
    h.accessor("verdict", {
      header: "Check run",
      sortFn: "alphanumeric",
      filterFn: "equalsString",
      cell: (i) => <span className={`rounded-full px-2 py-0.5 text-xs font-semibold ${VERDICT[i.getValue()] ?? "bg-line text-ink-soft"}`}>{i.getValue()}</span>,
    }),
    h.accessor("state", {
      header: "State",
      sortFn: "alphanumeric",
      filterFn: "equalsString",
      cell: (i) => (
        <div className="max-w-56">
          <span className={i.getValue() === "disqualified" ? "font-semibold text-fail" : ""}>{i.getValue()}</span>
          {i.row.original.disqualifiedReason && <p className="mt-0.5 text-xs text-ink-soft">{i.row.original.disqualifiedReason}</p>}
        </div>
      ),
    }),
    h.display({
      id: "files",
      header: "Files",
      cell: (i) =>
        i.row.original.files.length === 0 ? (
          <span className="text-mute">—</span>
        ) : (
          <ul className="space-y-0.5">
            {i.row.original.files.map((f) => (
              <li key={f.id}>
                <a href={`/organize/${competitionId}/files/${f.id}`} className="text-signal underline-offset-2 hover:underline" aria-label={`Download ${f.kind} ${f.filename}`}>
                  {f.kind}
                </a>{" "}
                <span className="text-xs text-mute">{fmtBytes(f.sizeBytes)}</span>
              </li>
            ))}
          </ul>
        ),
    }),
    h.display({
      id: "actions",
      header: "Actions",
      cell: (i) => <EntryActions entry={i.row.original} competitionId={competitionId} lastResult={lastEntryId === i.row.original.id ? lastResult : undefined} busy={busy} />,
    }),
  ]);

  const table = useTable({
    features,
    columns,
    data: rows,
    globalFilterFn: "includesString",
    getColumnCanGlobalFilter: (column) => ["crewHandle", "title"].includes(column.id),
    initialState: { sorting: [{ id: "crewHandle", desc: false }] },
  });

  const stateColumn = table.getColumn("state");
  const verdictColumn = table.getColumn("verdict");
  const shown = table.getRowModel().rows;

  return (
    <div>
      <div className="mb-4 flex flex-wrap items-end gap-4">
        <div>
          <label htmlFor="entry-search" className="label">
            Search crew or title
          </label>
          <input id="entry-search" className="field" type="search" value={String(table.state.globalFilter ?? "")} onChange={(e) => table.setGlobalFilter(e.target.value)} />
        </div>
        <div>
          <label htmlFor="entry-state" className="label">
            State
          </label>
          <select id="entry-state" className="field" value={String(stateColumn?.getFilterValue() ?? "")} onChange={(e) => stateColumn?.setFilterValue(e.target.value || undefined)}>
            <option value="">all</option>
            <option value="active">active</option>
            <option value="disqualified">disqualified</option>
            <option value="withdrawn">withdrawn</option>
          </select>
        </div>
        <div>
          <label htmlFor="entry-verdict" className="label">
            Check run
          </label>
          <select id="entry-verdict" className="field" value={String(verdictColumn?.getFilterValue() ?? "")} onChange={(e) => verdictColumn?.setFilterValue(e.target.value || undefined)}>
            <option value="">all</option>
            <option value="pass">pass</option>
            <option value="warn">warn</option>
            <option value="fail">fail</option>
            <option value="running">running</option>
            <option value="queued">queued</option>
            <option value="none">none</option>
          </select>
        </div>
        <fieldset className="text-sm">
          <legend className="label">Columns</legend>
          <div className="flex flex-wrap gap-3">
            {table
              .getAllLeafColumns()
              .filter((c) => c.id !== "actions")
              .map((c) => (
                <label key={c.id} className="flex items-center gap-1">
                  <input type="checkbox" className="accent-signal" checked={c.getIsVisible()} onChange={(e) => c.toggleVisibility(e.target.checked)} />
                  {typeof c.columnDef.header === "string" ? c.columnDef.header : c.id}
                </label>
              ))}
          </div>
        </fieldset>
      </div>
      <p className="mb-2 text-sm text-mute" role="status" data-testid="entries-shown">
        {shown.length} of {rows.length} entries
      </p>
      <div className="overflow-x-auto rounded-xl border border-line bg-card">
        <table className="w-full text-left text-sm" data-testid="entries-table">
          <thead className="border-b border-line bg-paper">
            {table.getHeaderGroups().map((g) => (
              <tr key={g.id}>
                {g.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  const canSort = header.column.getCanSort() && header.column.id !== "files" && header.column.id !== "actions";
                  return (
                    <th key={header.id} scope="col" className="px-3 py-2 font-semibold" aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : undefined}>
                      {canSort ? (
                        <button type="button" onClick={header.column.getToggleSortingHandler()} className="inline-flex items-center gap-1 hover:text-signal">
                          <FlexRender header={header} />
                          <span aria-hidden="true">{sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}</span>
                        </button>
                      ) : (
                        <FlexRender header={header} />
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {shown.map((row) => (
              <tr key={row.id} className="border-b border-line align-top last:border-0" data-entry={row.original.id}>
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2">
                    <FlexRender cell={cell} />
                  </td>
                ))}
              </tr>
            ))}
            {shown.length === 0 && (
              <tr>
                <td colSpan={99} className="px-3 py-6 text-center text-mute">
                  No entries match.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
    </div>
  );
}

function EntryActions({ entry, competitionId, lastResult, busy }: { entry: EntryRowView; competitionId: string; lastResult?: SubmissionResult<string[]>; busy: boolean }) {
  const [form, fields] = useForm({
    id: `dq-${entry.id}`,
    lastResult,
    shouldValidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: disqualifySchema }),
  });
  return (
    <div className="flex min-w-56 flex-col gap-2">
      {entry.state !== "disqualified" && (
        <details open={!!lastResult && lastResult.status === "error"}>
          <summary className="cursor-pointer text-sm font-semibold text-fail">Disqualify…</summary>
          <Form method="post" {...getFormProps(form)} className="mt-2">
            <input type="hidden" name="intent" value="disqualify" />
            <input type="hidden" name="entryId" value={entry.id} />
            <label htmlFor={fields.reason.id} className="label">
              Reason (mailed to the crew)
            </label>
            <textarea {...getTextareaProps(fields.reason)} rows={3} className="field" aria-describedby={fields.reason.errors ? `${fields.reason.id}-error` : undefined} />
            {fields.reason.errors && (
              <p id={`${fields.reason.id}-error`} role="alert" className="field-error">
                {fields.reason.errors.join(" ")}
              </p>
            )}
            {form.errors && (
              <p role="alert" className="field-error">
                {form.errors.join(" ")}
              </p>
            )}
            <button type="submit" className="btn-quiet mt-2 border-fail text-fail" disabled={busy}>
              Disqualify {entry.crewHandle}
            </button>
          </Form>
        </details>
      )}
      {entry.feeState === "paid" && (
        <Form method="post" action={`/organize/${competitionId}/entries/${entry.id}/refund`}>
          <button type="submit" className="btn-quiet" disabled={busy}>
            Refund
          </button>
        </Form>
      )}
    </div>
  );
}
