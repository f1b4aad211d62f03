/**
 * How stage mode fits a capture on the screen: whole-pixel scaling only, so every pixel of the 640×480 picture
 * becomes a k×k block (drawn nearest-neighbour: CSS `image-rendering: pixelated`), centred, with black bars
 * (letterbox or pillarbox) around it. k = floor(min(W / 640, H / 480)). A window smaller than the picture
 * cannot show whole pixels; there the picture is shrunk to fit and `whole` says so.
 */
export const STAGE_SOURCE = { width: 640, height: 480 } as const;

export interface StageFit {
  /** pixels of the screen per pixel of the picture */
  scale: number;
  /** false when the screen is smaller than the picture and it had to be shrunk by a fraction */
  whole: boolean;
  width: number;
  height: number;
  /** offsets of the picture's top-left corner inside the screen (the bars' widths) */
  left: number;
  top: number;
}

export function stageFit(screenWidth: number, screenHeight: number, source: { width: number; height: number } = STAGE_SOURCE): StageFit {
  if (!(screenWidth > 0 && screenHeight > 0 && source.width > 0 && source.height > 0)) {
    return { scale: 0, whole: false, width: 0, height: 0, left: 0, top: 0 };
  }
  const exact = Math.min(screenWidth / source.width, screenHeight / source.height);
  const whole = exact >= 1;
  const scale = whole ? Math.floor(exact) : exact;
  const width = Math.round(source.width * scale);
  const height = Math.round(source.height * scale);
  return { scale, whole, width, height, left: Math.floor((screenWidth - width) / 2), top: Math.floor((screenHeight - height) / 2) };
}

/**
 * The same fit for a browser: `cssWidth`×`cssHeight` is the window in CSS pixels and `devicePixelRatio` the
 * screen's pixels per CSS pixel. Whole pixels are counted on the screen itself (at 125 % desktop scaling a whole
 * number of CSS pixels is not a whole number of screen pixels); the result is in CSS pixels for the style.
 */
export function stageFitCss(cssWidth: number, cssHeight: number, devicePixelRatio: number, source: { width: number; height: number } = STAGE_SOURCE): StageFit {
  const dpr = devicePixelRatio > 0 && Number.isFinite(devicePixelRatio) ? devicePixelRatio : 1;
  const device = stageFit(Math.round(cssWidth * dpr), Math.round(cssHeight * dpr), source);
  return { scale: device.scale, whole: device.whole, width: device.width / dpr, height: device.height / dpr, left: device.left / dpr, top: device.top / dpr };
}
