import { FlashAnalyzer, flashGrid, type FlashReport, type FlashViewing } from "./flash";
import { lumaGrid, shrink, spreadIndices, THUMBNAIL_FACTOR, type RgbImage } from "./frames";

export const CONTACT_SHEET_FRAMES = 12;
/** 32×24 luma per frame, for comparing an uploaded capture (compare-video.server.ts) */
export const COMPARE_GRID = { width: 32, height: 24 };
const FLASH_CELL = 4; // 640×480 → 160×120 cells
/** Thumbnails kept on the way at most: every `stride`-th frame, the stride doubling whenever more would be kept. */
const KEPT_THUMBNAILS = 2 * CONTACT_SHEET_FRAMES;

/**
 * What the reference capture keeps of each frame, taken as the frames arrive so that no frame is held
 * longer than needed and the length of the run need not be known in advance: contact-sheet thumbnails,
 * the comparison grid and the flash state.
 */
export class FrameDigest {
  readonly luma: Uint8Array[] = [];
  private readonly thumbs = new Map<number, RgbImage>();
  private stride = 1;
  private readonly analyzer: FlashAnalyzer | null;
  private next = 0;
  private tail = 0;

  /** `flashFps` null turns the flash check off. */
  constructor(readonly width: number, readonly height: number, flashFps: number | null, viewing: FlashViewing = "desk") {
    this.analyzer = flashFps === null ? null : new FlashAnalyzer(width / FLASH_CELL, height / FLASH_CELL, flashFps, viewing);
  }

  /** Frames of the demo pushed so far (tail frames not counted). */
  get count(): number {
    return this.next;
  }

  /** Tail frames (after the loop point) pushed so far. */
  get tailCount(): number {
    return this.tail;
  }

  push(img: RgbImage, index: number): void {
    if (this.tail > 0) throw new RangeError("a frame of the demo arrived after the tail had begun");
    if (index !== this.next) throw new RangeError(`frame ${index} arrived, frame ${this.next} was due`);
    if (index % this.stride === 0) {
      this.thumbs.set(index, shrink(img, THUMBNAIL_FACTOR));
      if (this.thumbs.size > KEPT_THUMBNAILS) {
        this.stride *= 2;
        for (const k of [...this.thumbs.keys()]) if (k % this.stride !== 0) this.thumbs.delete(k);
      }
    }
    this.luma.push(lumaGrid(img, COMPARE_GRID.width, COMPARE_GRID.height));
    this.analyzer?.push(flashGrid(img, FLASH_CELL));
    this.next++;
  }

  /** A frame after the loop point: only the flash analysis sees it (windows wrapping round the loop point). */
  pushTail(img: RgbImage): void {
    this.analyzer?.push(flashGrid(img, FLASH_CELL));
    this.tail++;
  }

  /** Up to CONTACT_SHEET_FRAMES thumbnails spread over the frames that arrived, from those kept on the way. */
  thumbnails(): RgbImage[] {
    const kept = [...this.thumbs.keys()].sort((a, b) => a - b);
    if (kept.length === 0) return [];
    const picks = new Set<number>();
    for (const want of spreadIndices(this.next, CONTACT_SHEET_FRAMES)) {
      let best = kept[0];
      for (const k of kept) if (Math.abs(k - want) < Math.abs(best - want)) best = k;
      picks.add(best);
    }
    return [...picks].sort((a, b) => a - b).map((i) => this.thumbs.get(i)!);
  }

  /** null when the ruleset turns the flash check off. */
  flashReport(fps: number): FlashReport | null {
    return this.analyzer ? this.analyzer.report(fps) : null;
  }
}
