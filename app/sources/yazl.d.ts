// Minimal typing of the parts of yazl (a dev dependency that ships no types) that tests use.
declare module "yazl" {
  import type { Readable } from "node:stream";
  export interface EntryOptions {
    mode?: number;
    compress?: boolean;
    mtime?: Date;
  }
  export class ZipFile {
    outputStream: Readable;
    addBuffer(buffer: Buffer, metadataPath: string, options?: EntryOptions): void;
    addReadStream(stream: Readable, metadataPath: string, options?: EntryOptions): void;
    addEmptyDirectory(metadataPath: string, options?: EntryOptions): void;
    end(options?: Record<string, unknown>): void;
  }
}
