import { writeFile } from "node:fs/promises";
import { join } from "node:path";
import { generateDemoLayout } from "../support/demo-layout";
import { DEMO_RULESET } from "~/rules/ruleset";
import { renameInPlace, writeTarGz, writeZip } from "../fixtures/hostile/archives";

/**
 * The abuse corpus, generated per run (nothing hostile is committed as a file): hostile bundles, mutated GDSII
 * streams, and form/JSON bodies that are too big, of the wrong type or carry fields nobody asked for.
 */

/** A small deterministic PRNG (mulberry32), so a failing mutation can be replayed from its seed. */
export function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export interface HostileBundle {
  name: string;
  path: string;
  /** The intake refusal the bundle must earn (rule `intake.<code>`). */
  rule: string;
}

export async function hostileBundles(dir: string): Promise<HostileBundle[]> {
  const out: HostileBundle[] = [];
  const add = (name: string, file: string, rule: string) => out.push({ name, path: join(dir, file), rule });

  await writeZip(join(dir, "bomb.zip"), [{ name: "zeros.v", zeros: 64 * 1024 * 1024 }]);
  add("zip bomb (64 MiB of zeros)", "bomb.zip", "intake.zip-bomb");
  await writeTarGz(join(dir, "bomb.tar.gz"), [{ name: "zeros.v", data: "\0".repeat(40 * 1024 * 1024) }]);
  add("tar.gz bomb", "bomb.tar.gz", "intake.zip-bomb");

  await writeZip(join(dir, "climb.zip"), [{ name: "zz/evil.v", data: "module x; endmodule" }]);
  await renameInPlace(join(dir, "climb.zip"), "zz/evil.v", "../evil.v");
  add("zip member climbing out with ..", "climb.zip", "intake.path-traversal");
  await writeTarGz(join(dir, "climb.tar.gz"), [{ name: "ok.v", data: "x" }, { name: "rtl/../../escape.v", data: "x" }]);
  add("tar member climbing out with ..", "climb.tar.gz", "intake.path-traversal");
  await writeTarGz(join(dir, "absolute.tar.gz"), [{ name: "/tmp/gc-abuse-absolute.v", data: "x" }]);
  add("tar member with an absolute path", "absolute.tar.gz", "intake.absolute-path");
  await writeTarGz(join(dir, "symlink.tar.gz"), [{ name: "s.v", type: "symlink", linkname: "/etc/shadow" }]);
  add("tar symbolic link", "symlink.tar.gz", "intake.link");
  await writeTarGz(join(dir, "hardlink.tar.gz"), [{ name: "h.v", type: "link", linkname: "/etc/passwd" }]);
  add("tar hard link", "hardlink.tar.gz", "intake.link");
  await writeZip(join(dir, "symlink.zip"), [{ name: "passwd.v", data: "/etc/passwd", mode: 0o120777 }]);
  add("zip symbolic link", "symlink.zip", "intake.link");
  await writeTarGz(join(dir, "device.tar.gz"), [{ name: "null.v", type: "character-device" }]);
  add("tar character device", "device.tar.gz", "intake.device");

  const many = Array.from({ length: 10_000 }, (_, i) => ({ name: `f/${i}.v`, data: `// ${i}\n` }));
  await writeZip(join(dir, "many.zip"), many);
  add("10,000 tiny files (zip)", "many.zip", "intake.too-many-files");
  await writeTarGz(join(dir, "many.tar.gz"), many);
  add("10,000 tiny files (tar.gz)", "many.tar.gz", "intake.too-many-files");

  await writeFile(join(dir, "not-an-archive.zip"), Buffer.from("PK\u0003\u0004 this is not really a zip file at all"));
  add("a truncated zip header", "not-an-archive.zip", "intake.corrupt");
  return out;
}

/** `count` mutations of a valid demo layout: flipped bytes, truncations, inserted junk, corrupted record lengths. */
export function mutatedLayouts(count: number, seed = 2027): { seed: number; how: string; bytes: Buffer }[] {
  const base = Buffer.from(generateDemoLayout({ ruleset: DEMO_RULESET, shape: "single", flipFlops: 20, logicCells: 120, seed: 11 }).bytes);
  const out: { seed: number; how: string; bytes: Buffer }[] = [];
  for (let i = 0; i < count; i++) {
    const s = seed + i;
    const rnd = prng(s);
    const at = () => Math.floor(rnd() * base.length);
    const b = Buffer.from(base);
    const kind = i % 5;
    if (kind === 0) {
      for (let k = 0; k < 1 + Math.floor(rnd() * 16); k++) b[at()] = Math.floor(rnd() * 256);
      out.push({ seed: s, how: "flipped bytes", bytes: b });
    } else if (kind === 1) {
      out.push({ seed: s, how: "truncated", bytes: b.subarray(0, at()) });
    } else if (kind === 2) {
      const p = at();
      const junk = Buffer.from(Array.from({ length: 1 + Math.floor(rnd() * 64) }, () => Math.floor(rnd() * 256)));
      out.push({ seed: s, how: "junk inserted", bytes: Buffer.concat([b.subarray(0, p), junk, b.subarray(p)]) });
    } else if (kind === 3) {
      // A record length (the first two bytes of a record) set to 0, odd, or huge.
      const p = at() & ~1;
      b.writeUInt16BE([0, 1, 3, 0xffff, 2][Math.floor(rnd() * 5)], p);
      out.push({ seed: s, how: "record length corrupted", bytes: b });
    } else {
      const p = at();
      out.push({ seed: s, how: "a block repeated", bytes: Buffer.concat([b.subarray(0, p), b.subarray(p, Math.min(b.length, p + 4096)), b.subarray(p)]) });
    }
  }
  return out;
}

/** Bodies for form actions and JSON routes: each must get a report (form errors) or a clear 4xx, never a 5xx. */
export function hostileBodies(): { name: string; form?: Record<string, string>; json?: unknown; raw?: string; type?: string }[] {
  const big = "x".repeat(1024 * 1024);
  return [
    { name: "oversized fields", form: { email: `${big}@example.test`, password: big, name: big } },
    { name: "unexpected fields", form: { email: "a@b.test", password: "long-enough-password", role: "admin", isAdmin: "true", __proto__: "x", constructor: "y" } },
    { name: "wrong types (arrays where strings go)", raw: "email=a&email=b&password[]=1&password[]=2", type: "application/x-www-form-urlencoded" },
    { name: "JSON where a form goes", raw: JSON.stringify({ email: ["a"], password: { $gt: "" } }), type: "application/json" },
    { name: "JSON with wrong types", json: { files: "not-a-list", values: { a: "b" }, scores: [{ criterionId: 5, value: "ten" }], ranking: "first" } },
    { name: "JSON with unexpected fields", json: { __proto__: { admin: true }, constructor: { prototype: { admin: true } }, isAdmin: true, files: [] } },
    { name: "JSON nested deeply", raw: `${"[".repeat(50_000)}${"]".repeat(50_000)}`, type: "application/json" },
    { name: "JSON too big", raw: JSON.stringify({ blob: "y".repeat(2 * 1024 * 1024) }), type: "application/json" },
    { name: "broken JSON", raw: '{"files": [', type: "application/json" },
  ];
}

/** Designs that try to eat the machine: a 10^8-step generate loop, 10^5-deep recursive instantiation, a recursive constant function. */
const PORTS = `input clk, input rst_n, output [1:0] r, output [1:0] g, output [1:0] b, output hs, output vs, output audio`;

export const HOGS: Record<string, string> = {
  "huge generate loop": `module ${DEMO_RULESET.topModule}(${PORTS});
  genvar i;
  wire [99999999:0] w;
  generate for (i = 0; i < 100000000; i = i + 1) begin : g_loop
    assign w[i] = clk ^ rst_n;
  end endgenerate
  assign r = w[1:0]; assign g = 0; assign b = 0; assign hs = 0; assign vs = 0; assign audio = 0;
endmodule
`,
  "deep recursive instantiation": `module deep #(parameter N = 100000) (input a, output y);
  generate if (N == 0) begin : leaf
    assign y = a;
  end else begin : more
    deep #(.N(N - 1)) d (.a(a), .y(y));
  end endgenerate
endmodule
module ${DEMO_RULESET.topModule}(${PORTS});
  wire y;
  deep d (.a(clk), .y(y));
  assign r = {y, y}; assign g = 0; assign b = 0; assign hs = 0; assign vs = 0; assign audio = 0;
endmodule
`,
  "recursive function": `module ${DEMO_RULESET.topModule}(${PORTS});
  function automatic [31:0] f(input [31:0] n);
    f = (n == 0) ? 0 : f(n - 1) + 1;
  endfunction
  localparam [31:0] K = f(32'd50000000);
  assign r = K[1:0]; assign g = 0; assign b = 0; assign hs = 0; assign vs = 0; assign audio = 0;
endmodule
`,
};

