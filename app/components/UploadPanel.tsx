import { useEffect, useRef, useState } from "react";
import type { PlannedFile } from "~/entries/shapes";
import { ACCEPT_ATTR, FILE_KINDS, KIND_LABELS, REQUIRED_KINDS, type FileKind } from "~/entries/sniff";
import { checkCommit } from "~/sources/repository-link";

/** What the compo's ruleset lets the panel offer. */
export interface UploadPanelOptions {
  repositoryAllowed: boolean;
  licenceRequired: boolean;
  openLicencesOnly: boolean;
}

/**
 * The browser side of an upload: files go straight to S3 in presigned multipart parts. Each file has its own
 * progress bar. Before sending, it asks the server which parts S3 already holds and sends only the rest, so a broken
 * connection (or a reload: the upload id is kept in sessionStorage) resumes where it stopped. A failed part is
 * retried with a growing pause; when the connection stays down, the panel says so and offers Resume.
 */
interface Saved {
  uploadId: string;
  files: Record<string, { fileId: string; name: string; size: number; lastModified: number }>;
}
type FileStatus = { phase: "idle" | "sending" | "confirming" | "done" | "error" | "paused"; sent: number; message?: string; sha256?: string };
interface ApiError {
  error: { status: number; code: string; message: string; fieldErrors?: Record<string, string[]> };
}

const RETRIES = 4;

async function api<T>(url: string, body?: unknown): Promise<{ ok: true; data: T } | { ok: false; error: ApiError["error"] }> {
  const res = await fetch(url, body === undefined ? { headers: { accept: "application/json" } } : { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
  const data = (await res.json().catch(() => null)) as T | ApiError | null;
  if (res.ok) return { ok: true, data: data as T };
  return { ok: false, error: (data as ApiError | null)?.error ?? { status: res.status, code: "http", message: `The server answered ${res.status}.` } };
}

class ConnectionLost extends Error {}

function putPart(url: string, blob: Blob, onProgress: (loaded: number) => void): Promise<string> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open("PUT", url);
    xhr.upload.onprogress = (e) => onProgress(e.loaded);
    xhr.onload = () => (xhr.status >= 200 && xhr.status < 300 ? resolve(xhr.getResponseHeader("ETag") ?? "") : reject(new ConnectionLost(`storage answered ${xhr.status}`)));
    xhr.onerror = () => reject(new ConnectionLost("the connection broke"));
    xhr.ontimeout = () => reject(new ConnectionLost("the connection timed out"));
    xhr.send(blob);
  });
}

const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));
const storageKey = (entryId: string) => `gatecrash-upload:${entryId}`;
const fmtSize = (n: number) => (n < 1024 ? `${n} B` : n < 1048576 ? `${(n / 1024).toFixed(1)} KiB` : `${(n / 1048576).toFixed(1)} MiB`);

export function UploadPanel({ entryId, limits, options, onRecorded }: { entryId: string; limits: Record<FileKind, number>; options: UploadPanelOptions; onRecorded: () => void }) {
  const [files, setFiles] = useState<Partial<Record<FileKind, File>>>({});
  const [sourceMode, setSourceMode] = useState<"bundle" | "repository">("bundle");
  const [repoUrl, setRepoUrl] = useState("");
  const [commit, setCommit] = useState("");
  const [licence, setLicence] = useState("");
  const [sourceErrors, setSourceErrors] = useState<Record<string, string>>({});
  const fromRepository = options.repositoryAllowed && sourceMode === "repository";
  const kinds = FILE_KINDS.filter((k) => !(fromRepository && k === "bundle"));
  const required = REQUIRED_KINDS.filter((k) => kinds.includes(k));
  const [status, setStatus] = useState<Partial<Record<FileKind, FileStatus>>>({});
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ tone: "ok" | "warn" | "error"; text: string } | null>(null);
  const [saved, setSaved] = useState<Saved | null>(null);
  const fieldErrors = useRef<Partial<Record<FileKind, string>>>({});
  const [, force] = useState(0);

  useEffect(() => {
    const raw = sessionStorage.getItem(storageKey(entryId));
    if (raw) setSaved(JSON.parse(raw) as Saved);
  }, [entryId]);

  const save = (s: Saved | null) => {
    setSaved(s);
    if (s) sessionStorage.setItem(storageKey(entryId), JSON.stringify(s));
    else sessionStorage.removeItem(storageKey(entryId));
  };
  const set = (kind: FileKind, s: Partial<FileStatus>) => setStatus((old) => ({ ...old, [kind]: { phase: "idle", sent: 0, ...old[kind], ...s } }));

  const pick = (kind: FileKind, file: File | undefined) => {
    fieldErrors.current[kind] = file && file.size > limits[kind] ? `This file is ${fmtSize(file.size)}; at most ${fmtSize(limits[kind])} is allowed.` : undefined;
    setFiles((f) => ({ ...f, [kind]: file }));
    set(kind, { phase: "idle", sent: 0, message: undefined, sha256: undefined });
    force((n) => n + 1);
  };

  async function sendFile(kind: FileKind, file: File, plan: PlannedFile): Promise<boolean> {
    const uploadId = currentUpload.current!;
    const fileUrl = `/api/uploads/${uploadId}/files/${plan.id}`;
    const stored = await api<{ state: string; parts: { partNumber: number; size: number }[] }>(fileUrl);
    if (!stored.ok) throw new Error(stored.error.message);
    let done = stored.data.parts.reduce((n, p) => n + p.size, 0);
    if (stored.data.state === "uploading") {
      const have = new Set(stored.data.parts.map((p) => p.partNumber));
      const missing = Array.from({ length: plan.partCount }, (_, i) => i + 1).filter((n) => !have.has(n));
      set(kind, { phase: "sending", sent: done, message: have.size ? `Resuming: ${have.size} of ${plan.partCount} parts already stored.` : undefined });
      for (const n of missing) {
        const blob = file.slice((n - 1) * plan.partSize, Math.min(file.size, n * plan.partSize));
        for (let attempt = 1; ; attempt++) {
          try {
            const signed = await api<{ urls: Record<string, string> }>(fileUrl, { action: "sign", partNumbers: [n] });
            if (!signed.ok) throw new Error(signed.error.message);
            const etag = await putPart(signed.data.urls[n], blob, (loaded) => set(kind, { sent: done + loaded }));
            const noted = await api(fileUrl, { action: "part", partNumber: n, etag, size: blob.size });
            if (!noted.ok) throw new Error(noted.error.message);
            break;
          } catch (e) {
            if (!(e instanceof ConnectionLost || e instanceof TypeError) || attempt >= RETRIES) {
              set(kind, { phase: "paused", message: `Stopped at part ${n} of ${plan.partCount}: ${(e as Error).message}. Press Resume; stored parts are kept.` });
              return false;
            }
            set(kind, { message: `Part ${n} failed (${(e as Error).message}); retry ${attempt} of ${RETRIES - 1}…` });
            await pause(500 * 2 ** attempt);
          }
        }
        done += blob.size;
        set(kind, { sent: done });
      }
    }
    set(kind, { phase: "confirming", sent: file.size, message: "Checking the stored file…" });
    const confirmed = await api<{ file: { sha256: string; sizeBytes: number } }>(fileUrl, { action: "confirm" });
    if (!confirmed.ok) {
      set(kind, { phase: "error", message: confirmed.error.message });
      return false;
    }
    set(kind, { phase: "done", sent: file.size, sha256: confirmed.data.file.sha256, message: undefined });
    return true;
  }

  const currentUpload = useRef<string | null>(null);

  async function run() {
    setMessage(null);
    setSourceErrors({});
    const chosen = kinds.filter((k) => files[k]);
    const missing = required.filter((k) => !files[k]);
    if (fromRepository) {
      const c = checkCommit(commit);
      const problems: Record<string, string> = {};
      if (!repoUrl.trim()) problems.repository = "Give the repository's link.";
      if (!c.ok) problems.commit = c.message;
      if (Object.keys(problems).length) {
        setSourceErrors(problems);
        setMessage({ tone: "error", text: "The repository link or commit needs fixing; see beside it." });
        return;
      }
    }
    if (missing.length) {
      setMessage({ tone: "error", text: `Choose ${missing.map((k) => KIND_LABELS[k]).join(" and ")} first.` });
      return;
    }
    if (chosen.some((k) => fieldErrors.current[k])) {
      setMessage({ tone: "error", text: "A file is larger than this compo allows; see beside it." });
      return;
    }
    setBusy(true);
    try {
      // Resume the saved upload when it is still pending on the server; files changed since are replaced.
      let plans: Record<string, PlannedFile> = {};
      let current = saved;
      if (current) {
        const st = await api<{ state: string; files: PlannedFile[] }>(`/api/uploads/${current.uploadId}`);
        if (st.ok && st.data.state === "pending") plans = Object.fromEntries(st.data.files.map((f) => [f.kind, f]));
        else current = null;
      }
      if (!current) {
        const started = await api<{ uploadId: string; files: PlannedFile[] }>(`/api/entries/${entryId}/uploads`, {
          files: chosen.map((k) => ({ kind: k, filename: files[k]!.name, size: files[k]!.size })),
          repository: fromRepository ? { url: repoUrl.trim(), commit: commit.trim() } : null,
          licence: licence.trim() || null,
        });
        if (!started.ok) {
          const sourceKeys = ["repository", "commit", "licence"];
          setSourceErrors(Object.fromEntries(Object.entries(started.error.fieldErrors ?? {}).filter(([k]) => sourceKeys.includes(k)).map(([k, v]) => [k, v.join(" ")])));
          for (const [k, errs] of Object.entries(started.error.fieldErrors ?? {})) if (!sourceKeys.includes(k)) set(k as FileKind, { phase: "error", message: errs.join(" ") });
          setMessage({ tone: "error", text: started.error.message });
          return;
        }
        plans = Object.fromEntries(started.data.files.map((f) => [f.kind, f]));
        current = { uploadId: started.data.uploadId, files: {} };
      }
      currentUpload.current = current.uploadId;
      for (const k of chosen) {
        const f = files[k]!;
        const s = current.files[k];
        const same = s && plans[k] && s.fileId === plans[k].id && s.name === f.name && s.size === f.size && s.lastModified === f.lastModified && plans[k].state !== "rejected";
        if (!same) {
          const put = await api<{ file: PlannedFile }>(`/api/uploads/${current.uploadId}/files`, { kind: k, filename: f.name, size: f.size });
          if (!put.ok) {
            set(k, { phase: "error", message: put.error.fieldErrors?.[k]?.join(" ") ?? put.error.message });
            setMessage({ tone: "error", text: put.error.message });
            return;
          }
          plans[k] = put.data.file;
          current.files[k] = { fileId: put.data.file.id, name: f.name, size: f.size, lastModified: f.lastModified };
        }
        save({ ...current });
      }
      for (const k of chosen) {
        const ok = await sendFile(k, files[k]!, plans[k]);
        if (!ok) {
          setMessage({ tone: "warn", text: "The upload is not finished. Fix or resume the file marked below; nothing stored is lost." });
          return;
        }
      }
      const done = await api<{ number: number; state: "complete" | "late"; message: string }>(`/api/uploads/${current.uploadId}`, { action: "complete" });
      if (!done.ok) {
        setMessage({ tone: "error", text: done.error.message });
        return;
      }
      save(null);
      setMessage({ tone: done.data.state === "complete" ? "ok" : "warn", text: done.data.message });
      onRecorded();
    } catch (e) {
      setMessage({ tone: "warn", text: `The upload stopped: ${(e as Error).message}. Press Resume when you are online again; stored parts are kept.` });
    } finally {
      setBusy(false);
    }
  }

  async function discard() {
    if (saved) await api(`/api/uploads/${saved.uploadId}`, { action: "abandon" });
    save(null);
    setStatus({});
    setMessage({ tone: "ok", text: "The unfinished upload was discarded." });
  }

  const anyPaused = Object.values(status).some((s) => s?.phase === "paused" || s?.phase === "error");
  return (
    <form
      className="card"
      aria-labelledby="upload-heading"
      onSubmit={(e) => {
        e.preventDefault();
        void run();
      }}
    >
      <h2 id="upload-heading" className="mb-1 text-lg font-bold">New upload</h2>
      <p className="mb-4 text-sm text-ink-soft">
        Sources (a bundle file{options.repositoryAllowed ? ", or a repository link and commit" : ""}) and the layout are required; the capture video and a still are optional. Every upload is kept and numbered; the newest on-time one counts unless you pick an earlier one.
      </p>
      {saved && !busy && (
        <div role="status" className="mb-4 rounded-md border border-warn bg-warn-soft px-3 py-2 text-sm text-warn">
          An unfinished upload was found. Choose the same files and press Resume to send only what is missing, or{" "}
          <button type="button" className="font-semibold underline" onClick={() => void discard()}>discard it</button>.
        </div>
      )}
      {options.repositoryAllowed && (
        <fieldset className="mb-4">
          <legend className="label">Sources from</legend>
          <div className="flex flex-wrap gap-4 text-sm">
            {(["bundle", "repository"] as const).map((m) => (
              <label key={m} className="flex items-center gap-2">
                <input type="radio" name="source-mode" value={m} checked={sourceMode === m} disabled={busy || Boolean(saved)} onChange={() => setSourceMode(m)} />
                {m === "bundle" ? "a bundle file (.zip, .tar.gz)" : "a repository link and commit"}
              </label>
            ))}
          </div>
        </fieldset>
      )}
      {fromRepository && (
        <div className="mb-4 grid gap-3">
          <TextField id="upload-repository" label="Repository link (https://…, public)" value={repoUrl} onChange={setRepoUrl} error={sourceErrors.repository} disabled={busy} placeholder="https://code.example.org/crew/entry.git" hint="Gatecrash fetches exactly the commit below, without submodules unless this compo allows them, and never with a password." />
          <TextField id="upload-commit" label="Commit (full hash from git rev-parse HEAD)" value={commit} onChange={setCommit} error={sourceErrors.commit} disabled={busy} mono placeholder="40 hex digits" />
        </div>
      )}
      <div className="mb-4">
        <TextField
          id="upload-licence"
          label={`Licence of your sources (SPDX identifier)${options.licenceRequired ? "" : ", optional"}`}
          value={licence}
          onChange={setLicence}
          error={sourceErrors.licence}
          disabled={busy}
          placeholder="e.g. MIT, Apache-2.0, CERN-OHL-P-2.0"
          hint={options.openLicencesOnly ? "This compo takes only OSI-approved open source licences." : "An SPDX identifier or expression, e.g. MIT OR Apache-2.0."}
        />
      </div>
      <div className="grid gap-4">
        {kinds.map((k) => {
          const s = status[k];
          const f = files[k];
          const pct = f && s ? Math.round((100 * s.sent) / Math.max(1, f.size)) : 0;
          const err = fieldErrors.current[k] ?? (s?.phase === "error" || s?.phase === "paused" ? s.message : undefined);
          const id = `upload-${k}`;
          return (
            <div key={k}>
              <label htmlFor={id} className="label">
                {KIND_LABELS[k]} {required.includes(k) ? <span className="text-signal">(required)</span> : <span className="text-mute">(optional)</span>}
              </label>
              <input
                id={id}
                type="file"
                accept={ACCEPT_ATTR[k]}
                disabled={busy}
                className="field"
                aria-describedby={err ? `${id}-error` : `${id}-hint`}
                aria-invalid={err ? true : undefined}
                onChange={(e) => pick(k, e.currentTarget.files?.[0])}
              />
              <p id={`${id}-hint`} className="mt-1 text-xs text-mute">At most {fmtSize(limits[k])}.</p>
              {f && s && s.phase !== "idle" && (
                <div className="mt-2" data-testid={`progress-${k}`}>
                  <progress className="h-2 w-full accent-signal" max={100} value={pct} aria-label={`${KIND_LABELS[k]}: ${pct}% sent`} />
                  <p className="text-xs text-ink-soft">
                    {s.phase === "done" ? (
                      <>Stored and checked · SHA-256 <span className="font-mono break-all">{s.sha256}</span></>
                    ) : (
                      <>{fmtSize(s.sent)} of {fmtSize(f.size)} · {s.phase === "confirming" ? "checking" : s.phase}{s.message && s.phase === "sending" ? ` · ${s.message}` : ""}</>
                    )}
                  </p>
                </div>
              )}
              {err && <p id={`${id}-error`} className="field-error" role="alert">{err}</p>}
            </div>
          );
        })}
      </div>
      {message && (
        <p role={message.tone === "error" ? "alert" : "status"} className={`mt-4 rounded-md px-3 py-2 text-sm font-medium ${message.tone === "ok" ? "bg-pass-soft text-pass" : message.tone === "warn" ? "bg-warn-soft text-warn" : "bg-fail-soft text-fail"}`}>
          {message.text}
        </p>
      )}
      <button type="submit" className="btn-signal mt-4" disabled={busy}>
        {busy ? "Uploading…" : saved || anyPaused ? "Resume upload" : "Upload"}
      </button>
    </form>
  );
}

function TextField(p: { id: string; label: string; value: string; onChange: (v: string) => void; error?: string; hint?: string; disabled?: boolean; placeholder?: string; mono?: boolean }) {
  return (
    <div>
      <label htmlFor={p.id} className="label">{p.label}</label>
      <input
        id={p.id}
        type="text"
        className={`field ${p.mono ? "font-mono" : ""}`}
        value={p.value}
        disabled={p.disabled}
        placeholder={p.placeholder}
        spellCheck={false}
        autoComplete="off"
        aria-invalid={p.error ? true : undefined}
        aria-describedby={p.error ? `${p.id}-error` : p.hint ? `${p.id}-hint` : undefined}
        onChange={(e) => p.onChange(e.currentTarget.value)}
      />
      {p.hint && <p id={`${p.id}-hint`} className="mt-1 text-xs text-mute">{p.hint}</p>}
      {p.error && <p id={`${p.id}-error`} className="field-error" role="alert">{p.error}</p>}
    </div>
  );
}
