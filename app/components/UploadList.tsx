import { Form } from "react-router";
import { formatInZone } from "~/competitions/zone-format";
import type { UploadRow } from "~/entries/shapes";
const fmt = (iso: string, timeZone: string) => formatInZone(iso, timeZone, { seconds: true });

const size = (n: number) => (n < 1024 ? `${n} B` : n < 1048576 ? `${(n / 1024).toFixed(1)} KiB` : `${(n / 1048576).toFixed(1)} MiB`);

/**
 * Recorded uploads, newest first: which one counts (picked or newest), late ones marked, the repository commit and
 * licence, every file with its SHA-256; the crew can pick an earlier on-time upload as the one judged.
 */
export function UploadList({ uploads, timeZone, canChoose = false }: { uploads: UploadRow[]; timeZone: string; canChoose?: boolean }) {
  if (uploads.length === 0) return <p className="text-mute">No uploads yet.</p>;
  return (
    <ol className="grid gap-3" aria-label="Uploads">
      {uploads.map((u) => (
        <li key={u.id} className={`card ${u.counts ? "border-pass" : ""}`} data-testid={`upload-${u.number}`}>
          <div className="flex flex-wrap items-center justify-between gap-2">
            <span className="text-lg font-bold">Upload #{u.number}</span>
            {u.counts ? (
              <span className="rounded-full bg-pass-soft px-2.5 py-0.5 text-xs font-semibold text-pass">{u.picked ? "Counts — picked as final" : "Counts"}</span>
            ) : u.state === "late" ? (
              <span className="rounded-full bg-fail-soft px-2.5 py-0.5 text-xs font-semibold text-fail">Late — not judged</span>
            ) : (
              <span className="rounded-full bg-line px-2.5 py-0.5 text-xs font-semibold text-ink-soft">Replaced</span>
            )}
          </div>
          <p className="text-sm text-mute">
            {fmt(u.completedAt, timeZone)}
            {u.lateException && <span className="ml-2 rounded-full bg-violet-soft px-2 py-0.5 text-xs font-semibold text-violet">after the deadline, under the late exception</span>}
          </p>
          {u.repository && (
            <p className="mt-1 text-sm" data-testid={`upload-${u.number}-commit`}>
              From <span className="break-all">{u.repository.url}</span> at commit <span className="font-mono text-xs break-all">{u.repository.commit}</span>
            </p>
          )}
          {u.licence && <p className="mt-1 text-sm">Licence: <span className="font-mono">{u.licence}</span></p>}
          {canChoose && u.state === "complete" && !u.counts && (
            <Form method="post" className="mt-2">
              <input type="hidden" name="intent" value="final" />
              <input type="hidden" name="upload" value={u.number} />
              <button type="submit" className="btn-quiet">Judge this upload instead</button>
            </Form>
          )}
          {canChoose && u.picked && (
            <Form method="post" className="mt-2">
              <input type="hidden" name="intent" value="final" />
              <input type="hidden" name="upload" value="newest" />
              <button type="submit" className="btn-quiet">Let the newest upload count again</button>
            </Form>
          )}
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
