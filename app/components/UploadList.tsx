import type { UploadRow } from "~/entries/shapes";
const fmt = (iso: string, timeZone: string) =>
  new Intl.DateTimeFormat("en-GB", { dateStyle: "medium", timeStyle: "long", timeZone }).format(new Date(iso));

const size = (n: number) => (n < 1024 ? `${n} B` : n < 1048576 ? `${(n / 1024).toFixed(1)} KiB` : `${(n / 1048576).toFixed(1)} MiB`);

/** Recorded uploads, newest first: which one counts, late ones marked, every file with its SHA-256. */
export function UploadList({ uploads, timeZone }: { uploads: UploadRow[]; timeZone: string }) {
  if (uploads.length === 0) return <p className="text-mute">No uploads yet.</p>;
  return (
    <ol className="grid gap-3" aria-label="Uploads">
      {uploads.map((u) => (
        <li key={u.id} className={`card ${u.counts ? "border-pass" : ""}`} data-testid={`upload-${u.number}`}>
          <div className="flex flex-wrap items-center justify-between gap-2">
            <span className="text-lg font-bold">Upload #{u.number}</span>
            {u.counts ? (
              <span className="rounded-full bg-pass-soft px-2.5 py-0.5 text-xs font-semibold text-pass">Counts</span>
            ) : u.state === "late" ? (
              <span className="rounded-full bg-fail-soft px-2.5 py-0.5 text-xs font-semibold text-fail">Late — not judged</span>
            ) : (
              <span className="rounded-full bg-line px-2.5 py-0.5 text-xs font-semibold text-ink-soft">Replaced</span>
            )}
          </div>
          <p className="text-sm text-mute">{fmt(u.completedAt, timeZone)}</p>
          <table className="mt-2 w-full text-left text-sm">
            <thead className="text-xs text-mute">
              <tr>
                <th scope="col" className="py-1 pr-2 font-medium">File</th>
                <th scope="col" className="py-1 pr-2 font-medium">Size</th>
                <th scope="col" className="py-1 font-medium">SHA-256</th>
              </tr>
            </thead>
            <tbody>
              {u.files.map((f) => (
                <tr key={f.kind} className="border-t border-line align-top">
                  <td className="py-1 pr-2">
                    <span className="block text-xs uppercase tracking-wide text-mute">{f.kind}</span>
                    {f.filename}
                  </td>
                  <td className="py-1 pr-2 whitespace-nowrap">{size(f.sizeBytes)}</td>
                  <td className="py-1 font-mono text-xs break-all">{f.sha256}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </li>
      ))}
    </ol>
  );
}
