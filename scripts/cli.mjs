#!/usr/bin/env node
/**
 * The CLIs' launcher: `node scripts/cli.mjs <check|recount> [args…]` (what `npm run check` and `npm run recount`
 * call). Plain JavaScript, so Node starts it without compiling anything: it bundles the CLI's TypeScript with
 * esbuild into `.gatecrash/cli/<name>.mjs` on first use, reuses that bundle while every file that went into it
 * (and package-lock.json, tsconfig.json, this launcher) is older than the bundle, rebuilds it otherwise, then runs it.
 * `npx tsx scripts/check.ts …` still runs the sources directly for development.
 */
import { mkdirSync, readFileSync, renameSync, statSync, writeFileSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";

const REPO = resolve(dirname(fileURLToPath(import.meta.url)), "..");
/** Where bundles go; GATECRASH_CLI_DIR moves them (tests build into a folder of their own). */
const OUT_DIR = process.env.GATECRASH_CLI_DIR ? resolve(process.env.GATECRASH_CLI_DIR) : join(REPO, ".gatecrash", "cli");

/** Each CLI: its TypeScript entry, which exports `cli(argv)`. */
export const CLIS = {
  check: "scripts/check.ts",
  recount: "scripts/recount.ts",
};

/** Files besides the bundle's own inputs whose change makes every bundle stale. */
const ALWAYS = ["package-lock.json", "tsconfig.json", "scripts/cli.mjs"];

/**
 * Packages left to Node at run time rather than bundled: native addons and packages that find their own files
 * on disk next to their code (esbuild itself; the AWS SDK's and pg-boss's lazily loaded parts are fine bundled).
 */
const EXTERNAL = ["esbuild", "fsevents", "lightningcss", "@tailwindcss/*", "vite", "playwright-core"];

function mtime(path) {
  try {
    return statSync(path).mtimeMs;
  } catch {
    return null;
  }
}

/** Why the bundle of `name` must be (re)built, or null when it is fresh. */
export function staleness(name) {
  const bundle = join(OUT_DIR, `${name}.mjs`);
  const built = mtime(bundle);
  if (built === null) return "not built yet";
  let inputs;
  try {
    inputs = JSON.parse(readFileSync(join(OUT_DIR, `${name}.inputs.json`), "utf8")).inputs;
  } catch {
    return "no list of inputs";
  }
  for (const rel of [...ALWAYS, ...inputs]) {
    const t = mtime(join(REPO, rel));
    if (t === null) return `${rel} is gone`;
    if (t > built) return `${rel} changed`;
  }
  return null;
}

/** Bundles one CLI; the bundle and its list of inputs are written next to each other, each replaced atomically. */
export async function buildCli(name) {
  const { build } = await import("esbuild");
  mkdirSync(OUT_DIR, { recursive: true });
  const tmp = join(OUT_DIR, `${name}.${process.pid}.tmp.mjs`);
  const result = await build({
    absWorkingDir: REPO,
    entryPoints: [CLIS[name]],
    outfile: tmp,
    bundle: true,
    platform: "node",
    format: "esm",
    target: "node20",
    tsconfig: join(REPO, "tsconfig.json"), // its `paths` give the `~/*` alias
    external: EXTERNAL,
    // Bundled CommonJS packages call require() for Node's own modules; an ES module has none of its own.
    banner: { js: 'import { createRequire as __gcRequire } from "node:module"; const require = __gcRequire(import.meta.url);' },
    metafile: true,
    logLevel: "error",
    legalComments: "none",
  });
  // Our own files; bundled packages change only with package-lock.json, which is always compared.
  const inputs = Object.keys(result.metafile.inputs).filter((p) => !p.includes(":") && !p.split("/").includes("node_modules"));
  writeFileSync(join(OUT_DIR, `${name}.inputs.json.tmp`), JSON.stringify({ inputs }));
  renameSync(join(OUT_DIR, `${name}.inputs.json.tmp`), join(OUT_DIR, `${name}.inputs.json`));
  renameSync(tmp, join(OUT_DIR, `${name}.mjs`));
  return join(OUT_DIR, `${name}.mjs`);
}

/** The bundle of `name`, built first when it is missing or stale. */
export async function ensureCli(name) {
  const bundle = join(OUT_DIR, `${name}.mjs`);
  if (staleness(name) === null) return bundle;
  return buildCli(name);
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const [name, ...args] = process.argv.slice(2);
  if (!Object.hasOwn(CLIS, name ?? "")) {
    console.error(`usage: node scripts/cli.mjs <${Object.keys(CLIS).join("|")}> [arguments]`);
    process.exit(2);
  }
  const bundle = await ensureCli(name);
  const mod = await import(pathToFileURL(bundle).href);
  await mod.cli(args);
}
