import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { LoopSeekBar } from "./PlayerGate";

describe("the seek bar with the loop point", () => {
  it("puts the mark where the loop starts, as a share of the video, and names the intro and the loop", () => {
    // a 2.0 s intro and an 8.0 s loop in a 10.0 s preview: the mark at 20 %
    const html = renderToStaticMarkup(createElement(LoopSeekBar, { time: 3, duration: 10, loop: { startSeconds: 2, periodSeconds: 8 }, onSeek: () => undefined }));
    expect(html).toContain('data-testid="loop-mark"');
    expect(html).toContain("left:20%");
    expect(html).toContain("Intro 0–2.0 s, then the loop");
    expect(html).toContain("the loop starts at 2.0 s and lasts 8.0 s");
    expect(html).toContain('max="10"');
  });
  it("says the whole video is the loop when there is no intro", () => {
    const html = renderToStaticMarkup(createElement(LoopSeekBar, { time: 0, duration: 34.1, loop: { startSeconds: 0, periodSeconds: 34.1 }, onSeek: () => undefined }));
    expect(html).toContain("left:0%");
    expect(html).toContain("The whole loop (34.1 s)");
  });
});
