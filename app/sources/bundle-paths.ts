import { BundleError } from "./bundle-error";

const MAX_PATH_CHARS = 1024;
const MAX_SEGMENT_CHARS = 255;
// Control characters (C0, DEL) and characters that mean something to a shell or Windows.
const FORBIDDEN_CHARS = /[\u0000-\u001f\u007f:*?"<>|]/;

/**
 * Turns an archive member name into a safe relative path ("src/top.v"), or refuses it.
 * Backslashes count as separators so a name made on Windows cannot smuggle `..\`.
 */
export function safeMemberPath(rawName: string): string {
  const name = rawName.replace(/\\/g, "/");
  if (name.startsWith("/") || /^[A-Za-z]:/.test(name)) {
    throw new BundleError("absolute-path", `"${printable(rawName)}" is an absolute path; bundles may only hold relative paths.`, rawName);
  }
  const segments = name.split("/").filter((s) => s !== "" && s !== ".");
  if (segments.includes("..")) {
    throw new BundleError("path-traversal", `"${printable(rawName)}" climbs out of the bundle with "..".`, rawName);
  }
  if (segments.length === 0) {
    throw new BundleError("bad-name", `An archive member has an empty name.`, rawName);
  }
  const path = segments.join("/");
  if (path.length > MAX_PATH_CHARS || segments.some((s) => s.length > MAX_SEGMENT_CHARS)) {
    throw new BundleError("bad-name", `"${printable(rawName).slice(0, 80)}…" is too long a path.`, rawName);
  }
  if (FORBIDDEN_CHARS.test(path)) {
    throw new BundleError("bad-name", `"${printable(rawName)}" contains characters not allowed in a file name.`, rawName);
  }
  return path;
}

/** Number of folders above the file: "top.v" is 0, "rtl/core/top.v" is 2. */
export function folderDepth(path: string): number {
  return path.split("/").length - 1;
}

function printable(name: string): string {
  // Control characters shown as code points so the message stays readable.
  return name.replace(/[\u0000-\u001f\u007f]/g, (c) => `\\x${c.charCodeAt(0).toString(16).padStart(2, "0")}`);
}

/** Remembers every file and folder so duplicates and file/folder clashes are refused. */
export class PathRegistry {
  private readonly files = new Set<string>();
  private readonly folders = new Set<string>();

  addFolder(path: string): void {
    const key = path.toLowerCase();
    if (this.files.has(key)) throw duplicate(path);
    this.addParents(path);
    this.folders.add(key);
  }

  addFile(path: string): void {
    const key = path.toLowerCase();
    if (this.files.has(key) || this.folders.has(key)) throw duplicate(path);
    this.addParents(path);
    this.files.add(key);
  }

  private addParents(path: string): void {
    const segments = path.toLowerCase().split("/");
    for (let i = 1; i < segments.length; i++) {
      const parent = segments.slice(0, i).join("/");
      if (this.files.has(parent)) throw duplicate(path);
      this.folders.add(parent);
    }
  }
}

function duplicate(path: string): BundleError {
  return new BundleError(
    "duplicate-path",
    `"${path}" appears twice in the bundle (names are compared ignoring case, and a file may not share a folder's name).`,
    path,
  );
}
