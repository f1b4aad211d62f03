import { spawnSync } from "node:child_process";
import { existsSync, readdirSync } from "node:fs";

/** Debian packages Gatecrash needs at run time, and the extra ones its tests use. */
export const RUNTIME_PACKAGES: Record<string, string> = {
  postgresql: "/usr/lib/postgresql",
  yosys: "/usr/bin/yosys",
  verilator: "/usr/bin/verilator",
  ffmpeg: "/usr/bin/ffmpeg",
  bubblewrap: "/usr/bin/bwrap",
  // the repository fetch: git inside the sandbox, socat as its relay to the worker's one-host proxy
  git: "/usr/bin/git",
  socat: "/usr/bin/socat",
};
export const TEST_PACKAGES: Record<string, string> = {
  klayout: "/usr/bin/klayout",
  iverilog: "/usr/bin/iverilog",
  chromium: "/usr/bin/chromium",
};

function missing(pkgs: Record<string, string>): string[] {
  return Object.entries(pkgs)
    .filter(([, probe]) => !existsSync(probe))
    .map(([name]) => name);
}

/** Installs what is missing with apt-get when root; otherwise says exactly what to install and stops. */
export function ensureDebianPackages(pkgs: Record<string, string>, log: (s: string) => void = console.log): void {
  const need = missing(pkgs);
  if (need.length === 0) return;
  if (process.getuid?.() !== 0) {
    throw new Error(
      `Gatecrash needs these Debian packages: ${need.join(" ")}\nInstall them with: sudo apt-get install -y ${need.join(" ")}`,
    );
  }
  log(`Installing Debian packages: ${need.join(" ")} (apt-get, about a minute)…`);
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  const update = spawnSync("apt-get", ["update", "-qq"], { stdio: "inherit", env });
  if (update.status !== 0) throw new Error("apt-get update failed; see the output above");
  const install = spawnSync("apt-get", ["install", "-y", "-qq", "--no-install-recommends", ...need], { stdio: "inherit", env });
  if (install.status !== 0) throw new Error(`apt-get install ${need.join(" ")} failed; see the output above`);
  const still = missing(pkgs);
  if (still.length) throw new Error(`still missing after apt-get: ${still.join(" ")}`);
}

export function postgresBinDir(): string {
  const versions = readdirSync("/usr/lib/postgresql")
    .filter((v) => existsSync(`/usr/lib/postgresql/${v}/bin/pg_ctl`))
    .sort((a, b) => Number(b) - Number(a));
  if (!versions[0]) throw new Error("no PostgreSQL server binaries under /usr/lib/postgresql");
  return `/usr/lib/postgresql/${versions[0]}/bin`;
}

