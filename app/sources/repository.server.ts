import { createReadStream, createWriteStream, existsSync, readFileSync, statSync, writeFileSync } from "node:fs";
import { mkdir, mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { pipeline } from "node:stream/promises";
import { createGzip } from "node:zlib";
import tarStream from "tar-stream";
import { runSandboxed } from "~/sandbox/sandbox.server";
import { FetchHostError, resolveFetchHost, startFetchProxy } from "./fetch-proxy.server";
import { checkCommit, checkRepositoryLink } from "./repository-link";
import { assertSandboxStarted, terminationSignal } from "./tool-run";

/**
 * Fetches exactly one commit of a public repository, inside the sandbox, and hands back its tree as a .tar.gz for
 * the ordinary bundle intake (same limits, same pre-check). Shallow (depth 1), no tags, no submodules unless the
 * ruleset allows them, git's protocols limited to http(s), no redirects, objects checked (fsck) as they arrive, no
 * credentials or config of any kind. The network: see app/sandbox/sandbox.server.ts (one host, through the proxy).
 */
export type RepositoryErrorCode = "bad-link" | "bad-commit" | "host" | "no-commit" | "too-large" | "timeout" | "sign-in" | "fetch" | "submodule";

export class RepositoryError extends Error {
  constructor(
    readonly code: RepositoryErrorCode,
    message: string,
  ) {
    super(message);
    this.name = "RepositoryError";
  }
}

export interface RepositoryRequest {
  url: string;
  commit: string;
  workDir: string;
  transferBytes: number;
  fetchSeconds: number;
  submodules: boolean;
  allowLoopback: boolean;
}

export interface Submodule {
  path: string;
  url: string;
  commit: string;
  /** Fetched into the tree (ruleset allows it), or left out. */
  fetched: boolean;
}

export interface FetchedRepository {
  archivePath: string;
  commit: string;
  /** Bytes the host(s) sent, submodules included. */
  transferredBytes: number;
  submodules: Submodule[];
}

const PROXY_PORT = 3128;
// The relay listens inside the sandbox's own network namespace; git talks to it as its HTTP proxy.
const FETCH_SCRIPT = `
set -eu
url="$1"; commit="$2"
socat TCP-LISTEN:${PROXY_PORT},bind=127.0.0.1,reuseaddr,fork UNIX-CONNECT:/build/proxy.sock 2>/dev/null &
tries=0
until grep -q ':${PROXY_PORT.toString(16).toUpperCase().padStart(4, "0")} 00000000:0000 0A' /proc/net/tcp; do
  tries=$((tries + 1)); [ "$tries" -lt 200 ] || { echo "gatecrash: the fetch relay did not start" >&2; exit 90; }
  sleep 0.02
done
export GIT_CONFIG_NOSYSTEM=1 GIT_CONFIG_GLOBAL=/dev/null GIT_TERMINAL_PROMPT=0 GIT_ASKPASS=/bin/false SSH_ASKPASS=/bin/false
export GIT_PROTOCOL_FROM_USER=0 GIT_ALLOW_PROTOCOL=http:https GIT_NO_REPLACE_OBJECTS=1 GIT_LFS_SKIP_SMUDGE=1
git init -q --bare /build/repo.git
cd /build/repo.git
git -c protocol.allow=never -c protocol.http.allow=always -c protocol.https.allow=always \\
    -c http.proxy=http://127.0.0.1:${PROXY_PORT} -c http.followRedirects=false -c credential.helper= \\
    -c core.askPass=/bin/false -c fetch.recurseSubmodules=false -c transfer.fsckObjects=true \\
    -c http.lowSpeedLimit=1 -c http.lowSpeedTime=30 \\
    fetch --quiet --depth=1 --no-tags --no-recurse-submodules "$url" "$commit" 2>/build/fetch.err || { cat /build/fetch.err >&2; exit 91; }
[ "$(git cat-file -t "$commit" 2>/dev/null)" = commit ] || { echo "gatecrash: fetched, but $commit is not a commit" >&2; exit 92; }
git archive --format=tar -o /build/tree.tar "$commit"
git ls-tree -r -z --full-tree "$commit" | tr '\\0' '\\n' | grep '^160000 commit ' > /build/gitlinks.txt || true
if git cat-file -e "$commit:.gitmodules" 2>/dev/null; then
  git cat-file blob "$commit:.gitmodules" > /build/gitmodules
  git config --file /build/gitmodules --null --get-regexp '^submodule\\..*\\.(path|url)$' > /build/submodules.txt || true
fi
`;

/** Fetches the entry's commit (and, when allowed, its submodules) and packs the tree as one .tar.gz. */
export async function fetchRepository(req: RepositoryRequest): Promise<FetchedRepository> {
  const link = checkRepositoryLink(req.url, { allowLoopback: req.allowLoopback });
  if (!link.ok) throw new RepositoryError("bad-link", link.message);
  const commit = checkCommit(req.commit);
  if (!commit.ok) throw new RepositoryError("bad-commit", commit.message);
  await mkdir(req.workDir, { recursive: true, mode: 0o755 });
  const budget = { left: req.transferBytes, total: req.transferBytes };
  const main = await fetchOne(link.url, commit.commit, req, budget);
  const submodules = readSubmodules(main.dir, link.url);
  const trees: { prefix: string; tar: string }[] = [{ prefix: "", tar: main.tar }];
  try {
    if (req.submodules) {
      for (const sub of submodules) {
        const subLink = checkRepositoryLink(sub.url, { allowLoopback: req.allowLoopback });
        if (!subLink.ok) throw new RepositoryError("submodule", `the submodule ${sub.path} points at ${sub.url}: ${subLink.message}`);
        const fetched = await fetchOne(subLink.url, sub.commit, req, budget);
        trees.push({ prefix: `${sub.path}/`, tar: fetched.tar });
        sub.fetched = true;
      }
    }
    const archivePath = join(req.workDir, "tree.tar.gz");
    await packTrees(trees, archivePath);
    return { archivePath, commit: commit.commit, transferredBytes: budget.total - budget.left, submodules };
  } finally {
    for (const t of trees) await rm(dirname(t.tar), { recursive: true, force: true });
  }
}

async function fetchOne(url: string, commit: string, req: RepositoryRequest, budget: { left: number; total: number }): Promise<{ dir: string; tar: string }> {
  const link = checkRepositoryLink(url, { allowLoopback: req.allowLoopback });
  if (!link.ok) throw new RepositoryError("bad-link", link.message);
  let addresses: string[];
  try {
    addresses = await resolveFetchHost(link.host, req.allowLoopback);
  } catch (e) {
    if (e instanceof FetchHostError) throw new RepositoryError("host", `Gatecrash did not fetch: ${e.message}.`);
    throw e;
  }
  // A Unix socket path holds at most 107 bytes (sun_path): the fetch's folder sits in the short system temp folder.
  const dir = await mkdtemp(join(tmpdir(), "gcf-"));
  if (join(dir, "proxy.sock").length > 100) throw new Error(`the temp folder ${tmpdir()} is too deep for the fetch's Unix socket; set TMPDIR to a short path`);
  writeFileSync(join(dir, "fetch.sh"), FETCH_SCRIPT);
  const proxy = await startFetchProxy({ socketPath: join(dir, "proxy.sock"), host: link.host, port: link.port, addresses, budgetBytes: budget.left });
  try {
    const run = await runSandboxed({
      command: "/bin/sh",
      args: ["/build/fetch.sh", link.url, commit],
      buildDir: dir,
      readOnly: [{ host: "/etc/ssl/certs", inside: "/etc/ssl/certs", optional: true }],
      limits: { wallSeconds: req.fetchSeconds, cpuSeconds: req.fetchSeconds, fileSizeBytes: Math.max(budget.left * 4, 64 * 1024 * 1024), processes: 64 },
    });
    assertSandboxStarted(run);
    budget.left -= proxy.received();
    const said = run.stderr.trim().split("\n").filter((l) => l && !l.startsWith("hint:")).slice(-4).join(" / ");
    if (proxy.overBudget()) {
      throw new RepositoryError("too-large", `the repository sent more than ${budget.total} bytes for commit ${commit}, this compo's limit for one fetch; fetching stopped there. Keep large files out of the commit (or out of the repository).`);
    }
    if (run.timedOut || terminationSignal(run)) {
      throw new RepositoryError("timeout", `fetching ${link.url} did not finish within ${req.fetchSeconds} s (or hit a CPU or size limit); the host may be slow or the repository too big.`);
    }
    if (run.exitCode !== 0) throw explainFailure(run.exitCode, said, link.url, commit, proxy.refused());
    return { dir, tar: join(dir, "tree.tar") };
  } catch (e) {
    // nothing of a failed fetch is kept; the error goes on as it came
    await rm(dir, { recursive: true, force: true });
    throw e;
  } finally {
    await proxy.close();
  }
}

function explainFailure(code: number | null, said: string, url: string, commit: string, refused: string[]): RepositoryError {
  if (refused.length) return new RepositoryError("fetch", `the host tried to send Gatecrash elsewhere (${refused.join(", ")}); only ${url} itself is fetched from.`);
  if (/could not read Username|Authentication failed|terminal prompts disabled|\b401\b|\b403\b/i.test(said)) {
    return new RepositoryError("sign-in", `${url} asks for a sign-in. Gatecrash fetches public repositories only: make it public, or upload a source bundle instead.`);
  }
  if (/not our ref|couldn't find remote ref|no such remote ref|unadvertised object|upload-pack: not our ref|not a tree|does not exist/i.test(said) || code === 92) {
    return new RepositoryError("no-commit", `the repository at ${url} has no commit ${commit} (or does not let it be fetched by its hash). Check the hash with \`git rev-parse HEAD\` and that the commit is pushed.`);
  }
  if (/\b30[1278]\b|redirect/i.test(said)) return new RepositoryError("fetch", `${url} redirects elsewhere; give the repository's own link (Gatecrash does not follow redirects).`);
  if (/\b404\b|not found|repository .* not found/i.test(said)) return new RepositoryError("fetch", `there is no repository at ${url}. Check the link.`);
  return new RepositoryError("fetch", `git could not fetch ${commit} from ${url}: ${said || `exit status ${code}`}`);
}

/**
 * The submodules the commit records: its gitlinks (path and commit, from the tree) with their links from
 * .gitmodules; a relative link (../lib.git) is taken relative to the entry's repository, as git does.
 */
function readSubmodules(dir: string, baseUrl: string): Submodule[] {
  const linksFile = join(dir, "gitlinks.txt");
  if (!existsSync(linksFile)) return [];
  const gitlinks = new Map<string, string>();
  for (const line of readFileSync(linksFile, "utf8").split("\n")) {
    const m = /^160000 commit ([0-9a-f]{40,64})\t(.+)$/.exec(line);
    if (m) gitlinks.set(m[2], m[1]);
  }
  const config = existsSync(join(dir, "submodules.txt")) ? readFileSync(join(dir, "submodules.txt"), "utf8").split("\0").filter(Boolean) : [];
  const byName = new Map<string, { path?: string; url?: string }>();
  for (const item of config) {
    const m = /^submodule\.(.+)\.(path|url)\n([\s\S]*)$/.exec(item);
    if (!m) continue;
    const entry = byName.get(m[1]) ?? {};
    entry[m[2] as "path" | "url"] = m[3];
    byName.set(m[1], entry);
  }
  const out: Submodule[] = [];
  for (const [path, commit] of gitlinks) {
    const declared = [...byName.values()].find((e) => e.path === path);
    const raw = declared?.url ?? "";
    let url = raw;
    if (/^\.\.?\//.test(raw)) url = new URL(raw, baseUrl.endsWith("/") ? baseUrl : `${baseUrl}/`).toString();
    out.push({ path, url: url || "(no link in .gitmodules)", commit, fetched: false });
  }
  return out;
}

/** One .tar.gz of the trees, each under its prefix; members pass through unchanged for the intake to judge. */
async function packTrees(trees: { prefix: string; tar: string }[], archivePath: string): Promise<void> {
  const pack = tarStream.pack();
  const written = pipeline(pack, createGzip(), createWriteStream(archivePath));
  for (const tree of trees) {
    const extract = tarStream.extract();
    const done = new Promise<void>((resolve, reject) => {
      extract.on("entry", (header, stream, next) => {
        // git archive writes a pax global header holding the commit id: not a member of the tree.
        if ((header.type as string) === "pax-global-header") {
          stream.resume();
          stream.on("end", next);
          return;
        }
        const renamed = { ...header, name: `${tree.prefix}${header.name}` };
        const written = (err?: Error | null) => (err ? reject(err) : next());
        if (header.type === "file") {
          stream.pipe(pack.entry(renamed, written));
        } else {
          stream.resume();
          pack.entry(renamed, written);
        }
      });
      extract.on("finish", resolve);
      extract.on("error", reject);
    });
    createReadStream(tree.tar).pipe(extract);
    await done;
  }
  pack.finalize();
  await written;
  if (statSync(archivePath).size === 0) throw new RepositoryError("fetch", "the fetched tree is empty");
}
