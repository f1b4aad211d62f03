/**
 * What a stored file really is, read from its first bytes (never from its name or the browser's claim).
 * Signatures: zip local file header "PK\x03\x04" and gzip "1f 8b" (their format specs: PKWARE APPNOTE, RFC 1952);
 * GDSII starts with a HEADER record: length 6, record type 0x00, data type 0x02 (GDSII Stream Format Manual 6.0);
 * WebM/Matroska EBML magic "1A 45 DF A3" (RFC 9559); MP4 "ftyp" box at offset 4 (ISO/IEC 14496-12);
 * PNG signature (RFC 2083) and JPEG SOI + marker "FF D8 FF" (ITU T.81).
 */
export const FILE_KINDS = ["bundle", "layout", "video", "still"] as const;
export type FileKind = (typeof FILE_KINDS)[number];

export const KIND_LABELS: Record<FileKind, string> = {
  bundle: "Source bundle (.zip or .tar.gz)",
  layout: "Layout (GDSII), .gds or .gds.gz",
  video: "Capture video (WebM or MP4)",
  still: "Still picture (PNG or JPEG)",
};

/** Bundle and layout make an upload complete; the capture video and the still are optional. */
export const REQUIRED_KINDS: readonly FileKind[] = ["bundle", "layout"];

export type SniffedType =
  | "application/zip"
  | "application/gzip"
  | "application/vnd.gdsii"
  | "video/webm"
  | "video/mp4"
  | "image/png"
  | "image/jpeg";

const startsWith = (head: Uint8Array, bytes: number[], at = 0) => head.length >= at + bytes.length && bytes.every((b, i) => head[at + i] === b);

export function sniff(head: Uint8Array): SniffedType | null {
  if (startsWith(head, [0x50, 0x4b, 0x03, 0x04])) return "application/zip";
  if (startsWith(head, [0x1f, 0x8b])) return "application/gzip";
  if (startsWith(head, [0x00, 0x06, 0x00, 0x02])) return "application/vnd.gdsii";
  if (startsWith(head, [0x1a, 0x45, 0xdf, 0xa3])) return "video/webm";
  if (startsWith(head, [0x66, 0x74, 0x79, 0x70], 4)) return "video/mp4";
  if (startsWith(head, [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a])) return "image/png";
  if (startsWith(head, [0xff, 0xd8, 0xff])) return "image/jpeg";
  return null;
}

const ACCEPTED: Record<FileKind, SniffedType[]> = {
  bundle: ["application/zip", "application/gzip"],
  // a .gds.gz: the inflated start is checked to be GDSII when the file is confirmed (layout-gzip.server.ts)
  layout: ["application/vnd.gdsii", "application/gzip"],
  video: ["video/webm", "video/mp4"],
  still: ["image/png", "image/jpeg"],
};

const DESCRIBE: Record<SniffedType, string> = {
  "application/zip": "a zip archive",
  "application/gzip": "a gzip file",
  "application/vnd.gdsii": "a GDSII stream",
  "video/webm": "a WebM/Matroska video",
  "video/mp4": "an MP4 video",
  "image/png": "a PNG picture",
  "image/jpeg": "a JPEG picture",
};

export type SniffResult = { ok: true; mediaType: SniffedType } | { ok: false; message: string };

/** Holds the bytes against the kind the entrant claimed; a mismatch gets a message that says what we found. */
export function checkKind(kind: FileKind, filename: string, head: Uint8Array): SniffResult {
  const found = sniff(head);
  if (found && ACCEPTED[kind].includes(found)) return { ok: true, mediaType: found };
  const what = found ? `it is ${DESCRIBE[found]}` : "its first bytes match none of the accepted formats";
  const wanted = ACCEPTED[kind].map((t) => DESCRIBE[t]).join(" or ");
  return { ok: false, message: `"${filename}" is not ${wanted}: ${what}. Choose the right file for "${KIND_LABELS[kind]}".` };
}

/** The browser-side hint for the file picker (the server decides from the bytes). */
export const ACCEPT_ATTR: Record<FileKind, string> = {
  bundle: ".zip,.tar.gz,.tgz,application/zip,application/gzip",
  layout: ".gds,.gds2,.gdsii,.gz,application/gzip",
  video: ".webm,.mkv,.mp4,video/webm,video/mp4",
  still: ".png,.jpg,.jpeg,image/png,image/jpeg",
};
