import { createHash } from "node:crypto";
import { createWriteStream, existsSync } from "node:fs";
import { pipeline } from "node:stream/promises";
import tarStream from "tar-stream";
import { mkdtemp, readFile, rm, truncate, stat, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { DEMO_RULESET } from "~/rules/ruleset";
import { renameInPlace, writeTarGz, writeZip } from "../../tests/fixtures/hostile/archives";
import { BundleError, extractBundle, sha256File, type BundleLimits } from "./intake.server";

const limits: BundleLimits = DEMO_RULESET.uploadLimits;
let work: string;
let n = 0;
const fresh = () => join(work, `case-${n++}`);

beforeAll(async () => {
  work = await mkdtemp(join(tmpdir(), "gc-intake-"));
});
afterAll(async () => {
  await rm(work, { recursive: true, force: true });
});

async function refusal(archive: string, dest: string, custom: BundleLimits = limits): Promise<BundleError> {
  const error = await extractBundle(archive, dest, custom).then(
    () => null,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(BundleError);
  // Partial output is removed.
  expect(existsSync(dest)).toBe(false);
  return error as BundleError;
}

describe("sha256File", () => {
  it('hashes "abc" as FIPS 180-2 appendix B.1 says', async () => {
    const file = join(work, "abc.txt");
    await writeFile(file, "abc");
    // FIPS 180-2, Appendix B.1 (SHA-256 example, one-block message "abc").
    expect(await sha256File(file)).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
  });
});

describe("extractBundle: good bundles", () => {
  const top = "// the top\nmodule gc_entry(input clk);\n\n  /* block\n     comment */\n  wire a; // trailing\nendmodule\n";
  const pkg = "`define W 4\n";

  it("unpacks a zip and lists files, hashes and Verilog lines", async () => {
    const archive = join(work, "good.zip");
    await writeZip(archive, [
      { name: "rtl/", directory: true },
      { name: "rtl/top.v", data: top },
      { name: "rtl/defs.vh", data: pkg },
      { name: "README.txt", data: "hello" },
    ]);
    const dest = fresh();
    const m = await extractBundle(archive, dest, limits);
    expect(m.format).toBe("zip");
    expect(m.files.map((f) => f.path)).toEqual(["README.txt", "rtl/defs.vh", "rtl/top.v"]);
    expect(m.verilogFiles).toEqual(["rtl/defs.vh", "rtl/top.v"]);
    // Code lines counted by hand: "module…", "wire a;", "endmodule", "`define W 4".
    expect(m.sourceLines).toBe(4);
    expect(m.totalBytes).toBe(Buffer.byteLength(top) + Buffer.byteLength(pkg) + 5);
    const topFile = m.files.find((f) => f.path === "rtl/top.v")!;
    // Reference digest from node:crypto (OpenSSL) over the same bytes.
    expect(topFile.sha256).toBe(createHash("sha256").update(top).digest("hex"));
    expect(await readFile(join(dest, "rtl/top.v"), "utf8")).toBe(top);
  });

  it("unpacks a tar.gz, detected by magic bytes whatever its name", async () => {
    const archive = join(work, "looks-like.zip");
    await writeTarGz(archive, [{ name: "src", type: "directory" }, { name: "src/top.sv", data: top }]);
    const m = await extractBundle(archive, fresh(), limits);
    expect(m.format).toBe("tar.gz");
    expect(m.verilogFiles).toEqual(["src/top.sv"]);
    expect(m.sourceLines).toBe(3);
  });
});

describe("extractBundle: hostile and broken bundles", () => {
  it("stops a zip bomb on the bytes actually inflated", async () => {
    const archive = join(work, "bomb.zip");
    await writeZip(archive, [{ name: "zeros.v", zeros: 64 * 1024 * 1024 }]);
    const archiveBytes = (await stat(archive)).size;
    expect(archiveBytes).toBeLessThan(1024 * 1024); // deflate squeezes zeros about 1000:1
    const error = await refusal(archive, fresh());
    expect(error.code).toBe("zip-bomb");
    const tarBomb = join(work, "bomb.tar.gz");
    await writeTarGz(tarBomb, [{ name: "zeros.v", data: "\0".repeat(40 * 1024 * 1024) }]);
    expect((await refusal(tarBomb, fresh())).code).toBe("zip-bomb");
  });

  it("stops a zip whose content passes the unpacked size, with the ratio out of the way", async () => {
    const archive = join(work, "big.zip");
    await writeZip(archive, [{ name: "a.v", zeros: 3 * 1024 * 1024 }]);
    const error = await refusal(archive, fresh(), { ...limits, bundleUnpackedBytes: 2 * 1024 * 1024, bundleCompressionRatio: 1e9 });
    expect(error.code).toBe("too-large");
  });

  it("refuses a zip member that climbs out with ..", async () => {
    const archive = join(work, "traversal.zip");
    await writeZip(archive, [{ name: "zz/evil.v", data: "x" }]);
    await renameInPlace(archive, "zz/evil.v", "../evil.v");
    const error = await refusal(archive, fresh());
    expect(error.code).toBe("path-traversal");
    expect(existsSync(join(work, "evil.v"))).toBe(false);
  });

  it("refuses a symbolic link in a zip", async () => {
    const archive = join(work, "link.zip");
    await writeZip(archive, [{ name: "passwd.v", data: "/etc/passwd", mode: 0o120777 }]);
    expect((await refusal(archive, fresh())).code).toBe("link");
  });

  it("refuses .. , absolute paths, links and devices in a tar.gz", async () => {
    const cases: [string, Parameters<typeof writeTarGz>[1], string][] = [
      ["dotdot", [{ name: "ok.v", data: "x" }, { name: "rtl/../../escape.v", data: "x" }], "path-traversal"],
      ["absolute", [{ name: "/tmp/gc-absolute.v", data: "x" }], "absolute-path"],
      ["symlink", [{ name: "s.v", type: "symlink", linkname: "/etc/shadow" }], "link"],
      ["hardlink", [{ name: "h.v", type: "link", linkname: "/etc/shadow" }], "link"],
      ["device", [{ name: "null.v", type: "character-device" }], "device"],
      ["fifo", [{ name: "pipe.v", type: "fifo" }], "device"],
      ["duplicate", [{ name: "a.v", data: "1" }, { name: "A.v", data: "2" }], "duplicate-path"],
      ["deep", [{ name: "1/2/3/4/5/6/7/8/9/x.v", data: "x" }], "too-deep"],
      ["control-character", [{ name: "bell\u0007.v", data: "x" }], "bad-name"],
      ["file-and-folder", [{ name: "rtl", data: "x" }, { name: "rtl/top.v", data: "x" }], "duplicate-path"],
    ];
    for (const [label, members, code] of cases) {
      const archive = join(work, `${label}.tar.gz`);
      await writeTarGz(archive, members);
      const error = await refusal(archive, fresh());
      expect({ label, code: error.code }).toEqual({ label, code });
      expect(error.message.length).toBeGreaterThan(10);
    }
    expect(existsSync("/tmp/gc-absolute.v")).toBe(false);
    expect(existsSync(join(work, "escape.v"))).toBe(false);
  });

  it("refuses 10,000 tiny files against the file limit", async () => {
    const members = Array.from({ length: 10_000 }, (_, i) => ({ name: `f${i}.v`, data: "x", store: true }));
    const zip = join(work, "many.zip");
    await writeZip(zip, members);
    expect((await refusal(zip, fresh())).code).toBe("too-many-files");
    const tgz = join(work, "many.tar.gz");
    await writeTarGz(tgz, members);
    expect((await refusal(tgz, fresh())).code).toBe("too-many-files");
  });

  it("refuses a file that is no archive, an empty file and a plain tar", async () => {
    const text = join(work, "top.v");
    await writeFile(text, "module top; endmodule\n");
    expect((await refusal(text, fresh())).code).toBe("not-an-archive");
    const empty = join(work, "empty.zip");
    await writeFile(empty, "");
    expect((await refusal(empty, fresh())).code).toBe("not-an-archive");
    const plainTar = join(work, "plain.tar");
    const pack = tarStream.pack();
    pack.entry({ name: "a.v" }, "x");
    pack.finalize();
    await pipeline(pack, createWriteStream(plainTar));
    const error = await refusal(plainTar, fresh());
    expect(error.code).toBe("not-an-archive");
    expect(error.message).toMatch(/tar\.gz/);
  });

  it("refuses truncated archives as corrupt", async () => {
    const members = [{ name: "a.v", data: "module a; endmodule\n".repeat(2000) }];
    const zip = join(work, "cut.zip");
    await writeZip(zip, members);
    await truncate(zip, Math.floor((await stat(zip)).size / 2));
    expect((await refusal(zip, fresh())).code).toBe("corrupt");
    const tgz = join(work, "cut.tar.gz");
    await writeTarGz(tgz, members);
    await truncate(tgz, Math.floor((await stat(tgz)).size / 2));
    expect((await refusal(tgz, fresh())).code).toBe("corrupt");
  });

  it("refuses an archive larger than bundleBytes before reading it", async () => {
    const archive = join(work, "small.zip");
    await writeZip(archive, [{ name: "a.v", data: "x".repeat(1000) }]);
    expect((await refusal(archive, fresh(), { ...limits, bundleBytes: 10 })).code).toBe("too-large");
  });
});
