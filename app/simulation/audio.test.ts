import { execFileSync } from "node:child_process";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { AudioError, audioFigures, encodeWav, pcmFromBuffer, waveformSvg } from "./audio";

function square(hz: number, rate: number, seconds: number, duty = 0.5): Int16Array {
  return Int16Array.from({ length: Math.round(rate * seconds) }, (_, i) => ((i * hz) / rate) % 1 < duty ? 32767 : -32768);
}

describe("WAV writer", () => {
  it("writes a file that ffmpeg (an independent reader) decodes back to the same samples", () => {
    const dir = mkdtempSync(join(tmpdir(), "gc-wav-"));
    const samples = Int16Array.from({ length: 4800 }, (_, i) => Math.round(Math.sin(i / 7) * 20000));
    writeFileSync(join(dir, "a.wav"), encodeWav(samples, 48_000));
    const probe = execFileSync("ffprobe", ["-v", "error", "-show_entries", "stream=codec_name,sample_rate,channels", "-of", "json", join(dir, "a.wav")]);
    expect(JSON.parse(probe.toString()).streams[0]).toMatchObject({ codec_name: "pcm_s16le", sample_rate: "48000", channels: 1 });
    const raw = execFileSync("ffmpeg", ["-v", "error", "-i", join(dir, "a.wav"), "-f", "s16le", "-"]);
    expect(Array.from(pcmFromBuffer(raw))).toEqual(Array.from(samples));
  });
  it("refuses a bad sample rate and odd PCM byte counts", () => {
    expect(() => encodeWav(new Int16Array(4), 0)).toThrow(AudioError);
    expect(() => pcmFromBuffer(new Uint8Array(3))).toThrow(AudioError);
  });
});

describe("audio figures", () => {
  it("finds the frequency of a square wave within 0.5 %", () => {
    for (const hz of [220, 1000, 4321]) {
      const f = audioFigures(square(hz, 48_000, 0.1), 48_000);
      expect(Math.abs(f.dominantHz! - hz) / hz).toBeLessThan(0.005);
    }
  });
  it("reports the DC offset of a 25 % duty pulse train and the RMS of its AC part", () => {
    // full-scale pulse train at duty d: mean = 2d − 1, AC RMS = 2·sqrt(d(1 − d)) (square-wave algebra)
    const f = audioFigures(square(500, 48_000, 0.2, 0.25), 48_000);
    expect(f.dcOffset).toBeCloseTo(-0.5, 2);
    expect(f.rms).toBeCloseTo(2 * Math.sqrt(0.25 * 0.75), 2);
  });
  it("has no dominant frequency for silence", () => {
    expect(audioFigures(new Int16Array(4800), 48_000)).toEqual({ rms: 0, dcOffset: 0, dominantHz: null });
    expect(audioFigures(new Int16Array(0), 48_000).dominantHz).toBeNull();
  });
  it("draws a waveform as SVG", () => {
    const svg = waveformSvg(square(100, 48_000, 0.05), 48_000, 200, 50);
    expect(svg.startsWith("<svg")).toBe(true);
    expect(svg.match(/M/g)!.length).toBe(200);
  });
});
