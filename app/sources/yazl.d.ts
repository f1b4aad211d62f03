// Minimal typing of the parts of yazl (it ships no types) that the app and tests use.
declare module "yazl" {
  import type { EventEmitter } from "node:events";
  import type { Readable } from "node:stream";
  export interface EntryOptions {
    mode?: number;
    compress?: boolean;
    mtime?: Date;
    /** for streams: checked against the bytes read; lets end() know the total size */
    size?: number;
  }
  export class ZipFile extends EventEmitter {
    outputStream: Readable;
    addBuffer(buffer: Buffer, metadataPath: string, options?: EntryOptions): void;
    addReadStream(stream: Readable, metadataPath: string, options?: EntryOptions): void;
    addReadStreamLazy(metadataPath: string, options: EntryOptions, getReadStream: (cb: (err: Error | null, stream: Readable) => void) => void): void;
    addEmptyDirectory(metadataPath: string, options?: EntryOptions): void;
    end(options?: Record<string, unknown>, calculatedTotalSizeCallback?: (size: number) => void): void;
  }
}
