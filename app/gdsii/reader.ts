import { GdsiiError } from "./errors";
import { summarize } from "./hierarchy";
import { RecordScanner } from "./scanner";
import { DEFAULT_READ_LIMITS, type LayoutSummary, type ReadLimits, type ReadOptions } from "./summary";

/**
 * Incremental reader: feed the stream chunk by chunk, then finish. Keeps at most one partial
 * record (< 64 KiB) between chunks, so memory follows the hierarchy, not the file size.
 */
export class LayoutReader {
  private readonly scanner: RecordScanner;
  private readonly limits: ReadLimits;
  private carry = new Uint8Array(0);
  private offset = 0;

  constructor(opts: ReadOptions = {}) {
    this.limits = { ...DEFAULT_READ_LIMITS, ...opts.limits };
    this.scanner = new RecordScanner(this.limits, opts.collectPlacements ?? 0);
  }

  /** Walks every complete record of `chunk` (after whatever was left over from the previous one). */
  push(chunk: Uint8Array): void {
    if (this.scanner.ended) return;
    let buf = chunk;
    let base = this.offset;
    if (this.carry.length > 0) {
      buf = new Uint8Array(this.carry.length + chunk.length);
      buf.set(this.carry, 0);
      buf.set(chunk, this.carry.length);
      base -= this.carry.length;
    }
    const view = new DataView(buf.buffer, buf.byteOffset, buf.byteLength);
    const used = this.scanner.scan(buf, view, 0, buf.length, base);
    this.carry = buf.slice(used);
    this.offset += chunk.length;
  }

  /**
   * Walks the complete records of buf[0, length) and returns how many bytes it used; the caller keeps the rest
   * (at most one partial record) at the start of its buffer for the next call. For callers that own their
   * buffer (a file read into it): nothing is copied. Not to be mixed with push().
   */
  scanOwned(buf: Uint8Array, view: DataView, length: number): number {
    if (this.scanner.ended) return length;
    const used = this.scanner.scan(buf, view, 0, length, this.offset);
    this.offset += used;
    this.carry = used < length ? buf.slice(used, length) : new Uint8Array(0);
    return used;
  }

  finish(): LayoutSummary {
    const s = this.scanner;
    if (!s.ended) {
      if (this.carry.length >= 4) {
        const claimed = (this.carry[0] << 8) | this.carry[1];
        throw new GdsiiError(
          `the file is truncated: the last record claims ${claimed} bytes but only ${this.carry.length} remain`,
          this.offset - this.carry.length,
        );
      }
      throw new GdsiiError(s.sawHeader ? "the file is truncated: it ends before ENDLIB" : "the file is empty or too short to be GDSII", this.offset);
    }
    return summarize(s, this.limits);
  }
}

/** Reads a whole GDSII stream held in memory. */
export function readLayout(bytes: Uint8Array, opts: ReadOptions = {}): LayoutSummary {
  const reader = new LayoutReader(opts);
  reader.push(bytes);
  return reader.finish();
}
