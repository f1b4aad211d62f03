import type { Finding } from "~/rules/findings";
/** Audio from the 1-bit pin: WAV container, level figures, dominant frequency, a waveform picture. */
export interface AudioFigures {
  /** RMS of the signal with its DC removed, full scale = 1 */
  rms: number;
  /** mean level, -1..1 (a PWM pin at 50 % duty gives about 0) */
  dcOffset: number;
  /** strongest frequency above 20 Hz, or null for silence or too short a clip */
  dominantHz: number | null;
}

export class AudioError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "AudioError";
  }
}

/** Little-endian signed 16-bit samples from a raw buffer. */
export function pcmFromBuffer(buf: Uint8Array): Int16Array {
  if (buf.byteLength % 2) throw new AudioError(`16-bit PCM needs an even number of bytes, got ${buf.byteLength}`);
  const out = new Int16Array(buf.byteLength / 2);
  const view = new DataView(buf.buffer, buf.byteOffset, buf.byteLength);
  for (let i = 0; i < out.length; i++) out[i] = view.getInt16(i * 2, true);
  return out;
}

/** A canonical PCM WAVE file (RIFF, fmt chunk with format 1, data chunk), mono 16-bit. */
export function encodeWav(samples: Int16Array, sampleRate: number): Buffer {
  if (!Number.isInteger(sampleRate) || sampleRate <= 0) throw new AudioError(`sample rate must be a positive whole number, not ${sampleRate}`);
  const dataBytes = samples.length * 2;
  const buf = Buffer.alloc(44 + dataBytes);
  buf.write("RIFF", 0, "ascii");
  buf.writeUInt32LE(36 + dataBytes, 4);
  buf.write("WAVE", 8, "ascii");
  buf.write("fmt ", 12, "ascii");
  buf.writeUInt32LE(16, 16);
  buf.writeUInt16LE(1, 20); // PCM
  buf.writeUInt16LE(1, 22); // mono
  buf.writeUInt32LE(sampleRate, 24);
  buf.writeUInt32LE(sampleRate * 2, 28);
  buf.writeUInt16LE(2, 32);
  buf.writeUInt16LE(16, 34);
  buf.write("data", 36, "ascii");
  for (let i = 0; i < samples.length; i++) buf.writeInt16LE(samples[i], 44 + i * 2);
  return buf;
}

/** Radix-2 FFT in place (length a power of two), magnitudes of the first half. */
function fftMagnitudes(re: Float64Array): Float64Array {
  const n = re.length;
  const im = new Float64Array(n);
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) { const t = re[i]; re[i] = re[j]; re[j] = t; }
  }
  // twiddles once for the largest stage; stage `len` uses every (n / len)-th of them
  const half = n >> 1;
  const cos = new Float64Array(half), sin = new Float64Array(half);
  for (let k = 0; k < half; k++) { cos[k] = Math.cos((-2 * Math.PI * k) / n); sin[k] = Math.sin((-2 * Math.PI * k) / n); }
  for (let len = 2; len <= n; len <<= 1) {
    const step = n / len, mid = len >> 1;
    for (let i = 0; i < n; i += len) {
      for (let k = 0; k < mid; k++) {
        const wr = cos[k * step], wi = sin[k * step];
        const a = i + k, b = a + mid;
        const xr = re[b] * wr - im[b] * wi, xi = re[b] * wi + im[b] * wr;
        re[b] = re[a] - xr; im[b] = im[a] - xi;
        re[a] += xr; im[a] += xi;
      }
    }
  }
  const mag = new Float64Array(half);
  for (let i = 0; i < half; i++) mag[i] = Math.sqrt(re[i] * re[i] + im[i] * im[i]);
  return mag;
}

const MAX_ANALYSED = 1 << 16;

export function audioFigures(samples: Int16Array, sampleRate: number): AudioFigures {
  if (samples.length === 0) return { rms: 0, dcOffset: 0, dominantHz: null };
  let sum = 0;
  for (const s of samples) sum += s / 32768;
  const dc = sum / samples.length;
  let sq = 0;
  for (const s of samples) sq += (s / 32768 - dc) ** 2;
  const rms = Math.sqrt(sq / samples.length);
  if (rms < 1e-4 || samples.length < 256) return { rms, dcOffset: dc, dominantHz: null };

  // Hann-windowed, zero-padded 2x for a finer grid, peak refined by a parabola through three bins.
  const used = Math.min(samples.length, MAX_ANALYSED);
  let n = 1;
  while (n < used * 2) n <<= 1;
  const re = new Float64Array(n);
  for (let i = 0; i < used; i++) re[i] = (samples[i] / 32768 - dc) * (0.5 - 0.5 * Math.cos((2 * Math.PI * i) / (used - 1)));
  const mag = fftMagnitudes(re);
  const minBin = Math.max(1, Math.ceil((20 * n) / sampleRate));
  let peak = minBin;
  for (let i = minBin; i < mag.length - 1; i++) if (mag[i] > mag[peak]) peak = i;
  const a = mag[peak - 1], b = mag[peak], c = mag[peak + 1] ?? 0;
  const denom = a - 2 * b + c;
  const shift = denom !== 0 ? (0.5 * (a - c)) / denom : 0;
  return { rms, dcOffset: dc, dominantHz: ((peak + shift) * sampleRate) / n };
}

/** Min/max envelope per column as an SVG picture; short clips show their individual samples. */
export function waveformSvg(samples: Int16Array, sampleRate: number, width = 800, height = 160): string {
  const mid = height / 2;
  const y = (s: number) => (mid - (s / 32768) * (mid - 2)).toFixed(1);
  const cols = Math.max(1, Math.min(width, samples.length));
  const per = samples.length / cols;
  const parts: string[] = [];
  for (let c = 0; c < cols; c++) {
    const from = Math.floor(c * per), to = Math.max(from + 1, Math.floor((c + 1) * per));
    let lo = 32767, hi = -32768;
    for (let i = from; i < to && i < samples.length; i++) {
      if (samples[i] < lo) lo = samples[i];
      if (samples[i] > hi) hi = samples[i];
    }
    const x = ((c + 0.5) * width) / cols;
    parts.push(`M${x.toFixed(1)} ${y(hi)}V${y(lo)}`);
  }
  const seconds = (samples.length / sampleRate).toFixed(3);
  return `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" role="img" aria-label="audio waveform, ${seconds} s">
<rect width="100%" height="100%" fill="#10131a"/>
<line x1="0" y1="${mid}" x2="${width}" y2="${mid}" stroke="#3a4150" stroke-width="1"/>
<path d="${samples.length ? parts.join("") : ""}" stroke="#7fd1b9" stroke-width="1" fill="none"/>
</svg>
`;
}

/** What the harness counted of the pin itself (summary.json), beside the filtered samples. */
export interface AudioPinCounts {
  risingEdges: number;
  maxRisingEdgesPerFrame: number;
  lowPassHz: number;
}

/** Upper end of the audible band (common practice, no source: the usual 20 Hz – 20 kHz of human hearing). */
export const AUDIBLE_LIMIT_HZ = 20_000;
/** RMS below this (full scale 1, DC removed) is heard as no signal: −60 dBFS, our own choice. */
export const DC_ONLY_RMS = 1e-3;
/** A sample within this many steps of either rail counts as clipped; more than CLIP_SHARE of them is flagged. */
const CLIP_STEPS = 16;
export const CLIP_SHARE = 0.01;
/** Edges less than this many times the strongest tone's frequency: the pin plays the tone itself (our own rule). */
const SQUARE_TONE_RATIO = 4;

export interface AudioChecks {
  /** the fastest the pin's rising edges came in any one frame, per second: a PWM carrier's frequency */
  carrierHz: number | null;
  clippedShare: number;
}

export function clippedShare(samples: Int16Array): number {
  if (samples.length === 0) return 0;
  let n = 0;
  for (const s of samples) if (s >= 32767 - CLIP_STEPS || s <= -32768 + CLIP_STEPS) n++;
  return n / samples.length;
}

/**
 * Findings for the audio pin: silence (it never toggles), DC only (it toggles, but the filtered signal does not move),
 * a PWM carrier inside the audible band, and clipping (the filtered signal at a rail, i.e. the duty cycle at 0 % or
 * 100 % for longer than the filter's time constant). `fps` turns the per-frame edge count into a frequency.
 */
export function audioFindings(figures: AudioFigures, pin: AudioPinCounts, samples: Int16Array, fps: number, hasAudioPin: boolean): { findings: Finding[]; checks: AudioChecks } {
  const findings: Finding[] = [];
  const carrierHz = pin.maxRisingEdgesPerFrame > 0 ? pin.maxRisingEdgesPerFrame * fps : null;
  const clipped = clippedShare(samples);
  const filter = `the pin through a first-order RC low-pass at ${pin.lowPassHz} Hz`;
  if (!hasAudioPin) return { findings, checks: { carrierHz, clippedShare: clipped } };
  const silent = pin.risingEdges === 0;
  findings.push({
    step: "simulation", rule: "audio.silence", verdict: silent ? "warn" : "pass",
    title: "The audio pin makes sound", measured: `${pin.risingEdges} rising edges`, limit: "at least one",
    evidence: silent ? "the audio pin never went high after reset in the captured span" : `${pin.risingEdges} rising edges in the captured span`,
    advice: silent ? "drive the audio pin (1-bit PWM or a square-wave tone), or leave this warning if the entry is silent on purpose" : undefined,
  });
  if (silent) return { findings, checks: { carrierHz, clippedShare: clipped } };
  const dcOnly = figures.rms < DC_ONLY_RMS;
  findings.push({
    step: "simulation", rule: "audio.dc-only", verdict: dcOnly ? "warn" : "pass",
    title: "The filtered audio carries a signal, not only a DC level", measured: `RMS ${figures.rms.toFixed(4)} of full scale`, limit: `≥ ${DC_ONLY_RMS} (−60 dBFS)`,
    evidence: `${filter}; DC level ${figures.dcOffset.toFixed(3)}`,
    advice: dcOnly ? "the pin toggles, but at a steady duty cycle: vary the duty cycle to make a tone" : undefined,
  });
  // a pin whose edges come about as often as the tone it makes is a square-wave tone, not a PWM DAC with a carrier
  const squareTone = carrierHz !== null && figures.dominantHz !== null && carrierHz < SQUARE_TONE_RATIO * figures.dominantHz;
  const audible = carrierHz !== null && carrierHz < AUDIBLE_LIMIT_HZ && !squareTone;
  findings.push({
    step: "simulation", rule: "audio.carrier", verdict: audible ? "warn" : "pass",
    title: "The PWM carrier is above the audible band", measured: carrierHz === null ? null : `${Math.round(carrierHz)} Hz`, limit: `≥ ${AUDIBLE_LIMIT_HZ} Hz (common practice, no source)`,
    evidence: squareTone
      ? `the pin's edges come at the tone's own rate (strongest tone ${Math.round(figures.dominantHz!)} Hz): a square-wave tone, no PWM carrier`
      : "the most rising edges of the pin in one frame, times the frame rate",
    advice: audible ? "a PWM DAC needs a carrier above 20 kHz (an 8-bit counter at 25 MHz gives about 98 kHz); a plain square-wave tone is fine if it is meant to be heard as it is" : undefined,
  });
  // a square-wave tone sits at the rails by nature: its flat tops are the waveform, not a clipped one
  const clipping = clipped > CLIP_SHARE && !squareTone;
  findings.push({
    step: "simulation", rule: "audio.clipping", verdict: clipping ? "warn" : "pass",
    title: "The filtered audio does not clip", measured: `${(clipped * 100).toFixed(1)} % of samples at a rail`, limit: `≤ ${CLIP_SHARE * 100} % (our own limit)`,
    evidence: squareTone ? `${filter}; a square-wave tone, whose flat tops at the rails are not clipping` : filter,
    advice: clipping ? "keep the duty cycle away from 0 % and 100 %: the filtered level sits at a rail there" : undefined,
  });
  return { findings, checks: { carrierHz, clippedShare: clipped } };
}
