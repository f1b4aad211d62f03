/** Any problem with a GDSII stream: what went wrong, in plain words, and where (byte offset, or -1 if nowhere). */
export class GdsiiError extends Error {
  readonly offset: number;
  constructor(message: string, offset = -1) {
    super(offset >= 0 ? `${message} (at byte ${offset})` : message);
    this.name = "GdsiiError";
    this.offset = offset;
  }
}
