import { FlashAnalyzer, flashGrid, type FlashReport } from "./flash";
import { lumaGrid, shrink, spreadIndices, THUMBNAIL_FACTOR, type RgbImage } from "./frames";

export const CONTACT_SHEET_FRAMES = 12;
/** 32×24 luma per frame, for comparing an uploaded capture (compare-video.server.ts) */
export const COMPARE_GRID = { width: 32, height: 24 };
const FLASH_CELL = 4; // 640×480 → 160×120 cells

/**
 * What the reference capture keeps of each frame, taken as the frames arrive so that no frame is held
 * longer than needed: contact-sheet thumbnails, the comparison grid and the flash state.
 */
export class FrameDigest {
  readonly luma: Uint8Array[] = [];
  private readonly thumbs = new Map<number, RgbImage>();
  private readonly picks: Set<number>;
  private readonly analyzer: FlashAnalyzer | null;
  private next = 0;

  /** `expectedFrames` decides which thumbnails to keep on the way; `flashFps` null turns the flash check off. */
  constructor(readonly width: number, readonly height: number, expectedFrames: number, flashFps: number | null) {
    this.picks = new Set(spreadIndices(expectedFrames, CONTACT_SHEET_FRAMES));
    this.analyzer = flashFps === null ? null : new FlashAnalyzer(width / FLASH_CELL, height / FLASH_CELL, flashFps);
  }

  get count(): number {
    return this.next;
  }

  push(img: RgbImage, index: number): void {
    if (index !== this.next) throw new RangeError(`frame ${index} arrived, frame ${this.next} was due`);
    if (this.picks.has(index)) this.thumbs.set(index, shrink(img, THUMBNAIL_FACTOR));
    this.luma.push(lumaGrid(img, COMPARE_GRID.width, COMPARE_GRID.height));
    this.analyzer?.push(flashGrid(img, FLASH_CELL));
    this.next++;
  }

  /** Thumbnails spread over the frames that did arrive; `read` fetches any not kept on the way (a short run). */
  thumbnails(read: (index: number) => RgbImage): RgbImage[] {
    return spreadIndices(this.next, CONTACT_SHEET_FRAMES).map((i) => this.thumbs.get(i) ?? shrink(read(i), THUMBNAIL_FACTOR));
  }

  /** null when the ruleset turns the flash check off. */
  flashReport(fps: number): FlashReport | null {
    return this.analyzer ? this.analyzer.report(fps) : null;
  }
}
