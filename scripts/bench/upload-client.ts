/**
 * An entrant's upload as the browser makes it, over HTTP against a running web server: start the upload, sign
 * each part, PUT it straight to the object store, report it, confirm each file, complete the upload. Used by the
 * checks bench, so its clock starts where a crew's does: when the server answers "recorded and counts".
 */
export interface UploadFile {
  kind: "bundle" | "layout" | "video" | "still";
  filename: string;
  bytes: Uint8Array;
}

export interface UploadedOk {
  uploadId: string;
  number: number;
  /** when the completion answer arrived (ms since the epoch, this process's clock) */
  confirmedAt: number;
}

export class UploadClient {
  constructor(
    private readonly base: string,
    private readonly cookie: string,
  ) {}

  private async post<T>(path: string, body: unknown): Promise<T> {
    const res = await fetch(this.base + path, {
      method: "POST",
      headers: { "content-type": "application/json", origin: this.base, cookie: this.cookie },
      body: JSON.stringify(body),
    });
    const text = await res.text();
    if (!res.ok) throw new Error(`POST ${path}: ${res.status} ${text.slice(0, 300)}`);
    return JSON.parse(text) as T;
  }

  /** Everything up to the point where the files are confirmed; `complete` then records the upload. */
  async prepare(entryId: string, files: UploadFile[]): Promise<{ uploadId: string; fileIds: Record<string, string> }> {
    const started = await this.post<{ uploadId: string; files: { id: string; kind: string; partCount: number }[] }>(`/api/entries/${entryId}/uploads`, {
      files: files.map((f) => ({ kind: f.kind, filename: f.filename, size: f.bytes.length })),
    });
    const fileIds: Record<string, string> = {};
    for (const planned of started.files) {
      const file = files.find((f) => f.kind === planned.kind)!;
      if (planned.partCount !== 1) throw new Error("bench files are sent in one part");
      const path = `/api/uploads/${started.uploadId}/files/${planned.id}`;
      const signed = await this.post<{ urls: Record<string, string> }>(path, { action: "sign", partNumbers: [1] });
      const put = await fetch(signed.urls[1], { method: "PUT", body: Buffer.from(file.bytes) });
      if (!put.ok) throw new Error(`PUT part of ${file.filename}: ${put.status}`);
      await this.post(path, { action: "part", partNumber: 1, etag: put.headers.get("etag"), size: file.bytes.length });
      await this.post(path, { action: "confirm" });
      fileIds[planned.kind] = planned.id;
    }
    return { uploadId: started.uploadId, fileIds };
  }

  async complete(uploadId: string): Promise<UploadedOk> {
    const done = await this.post<{ uploadId: string; number: number; state: string }>(`/api/uploads/${uploadId}`, { action: "complete" });
    if (done.state !== "complete") throw new Error(`upload ${uploadId} ended ${done.state}`);
    return { uploadId, number: done.number, confirmedAt: Date.now() };
  }

  async upload(entryId: string, files: UploadFile[]): Promise<UploadedOk> {
    const { uploadId } = await this.prepare(entryId, files);
    return this.complete(uploadId);
  }

  async check(entryId: string): Promise<BenchCheck | null> {
    const res = await fetch(`${this.base}/api/checks/${entryId}`, { headers: { accept: "application/json", cookie: this.cookie } });
    if (!res.ok) throw new Error(`GET /api/checks/${entryId}: ${res.status}`);
    return ((await res.json()) as { check: BenchCheck | null }).check;
  }
}

/** The part of the report API's answer the bench reads (app/conformance/report-types.ts). */
export interface BenchCheck {
  uploadNumber: number;
  run: { state: string; figures: { stepMs?: Record<string, number> } } | null;
  findings: { step: string; rule: string }[];
  artifacts: Record<string, unknown>;
}
