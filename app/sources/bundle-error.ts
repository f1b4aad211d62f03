export type BundleErrorCode =
  | "zip-bomb"
  | "path-traversal"
  | "absolute-path"
  | "bad-name"
  | "duplicate-path"
  | "link"
  | "device"
  | "too-many-files"
  | "too-deep"
  | "too-large"
  | "not-an-archive"
  | "corrupt";

/** A source bundle that Gatecrash will not unpack; the message is meant for the entrant. */
export class BundleError extends Error {
  readonly code: BundleErrorCode;
  /** The archive member concerned, when there is one. */
  readonly member: string | null;

  constructor(code: BundleErrorCode, message: string, member: string | null = null) {
    super(message);
    this.name = "BundleError";
    this.code = code;
    this.member = member;
  }
}
