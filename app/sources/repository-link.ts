/**
 * A repository link and commit as an entrant types them, checked before anything is stored or fetched. Pure (the
 * upload form runs it in the browser too). Only http(s) links to a public host are taken: git's other transports
 * run programs or read local files (file://, ext::, fd::, ssh's scp-like `host:path`), and a link with a user name,
 * password, query or fragment may carry a credential, which Gatecrash never stores or sends.
 */
export type LinkCheck = { ok: true; url: string; host: string; port: number; scheme: "https" | "http" } | { ok: false; message: string };

export interface LinkOptions {
  /** Allow hosts on the loopback range (tests serve a repository on 127.0.0.1); never other private ranges. */
  allowLoopback?: boolean;
}

const MAX_LINK = 500;

export function checkRepositoryLink(raw: string, opts: LinkOptions = {}): LinkCheck {
  const text = raw.trim();
  const no = (message: string): LinkCheck => ({ ok: false, message });
  if (!text) return no("Give the repository's link, e.g. https://code.example.org/crew/entry.git.");
  if (text.length > MAX_LINK) return no(`A repository link has at most ${MAX_LINK} characters.`);
  // Control characters and whitespace never belong in a link; a leading "-" would read as a git option.
  if (/[\s\u0000-\u001f\u007f]/.test(text) || text.startsWith("-")) return no("The link has spaces or control characters in it.");
  if (/^[A-Za-z][A-Za-z0-9+.-]*::/.test(text)) return no("Links of the form transport::address (ext::, fd:: …) run programs; give an https:// link.");
  if (!/^[A-Za-z][A-Za-z0-9+.-]*:\/\//.test(text)) {
    return /^[^/]+@[^/:]+:/.test(text) || /^[^/:]+:[^/]/.test(text)
      ? no("SSH links (user@host:path) need keys Gatecrash does not have; give the repository's https:// link.")
      : no("Give the full link with its scheme, e.g. https://code.example.org/crew/entry.git.");
  }
  let url: URL;
  try {
    url = new URL(text);
  } catch (e) {
    if (!(e instanceof TypeError)) throw e;
    return no("This is not a link Gatecrash can read.");
  }
  const scheme = url.protocol.slice(0, -1).toLowerCase();
  if (scheme === "file") return no("file:// links point into the checking machine itself; give the repository's https:// link.");
  if (scheme !== "https" && scheme !== "http") return no(`Links with ${scheme}:// are not fetched; give the repository's https:// link.`);
  if (url.username || url.password) {
    return no("The link holds a user name or password. Gatecrash fetches public repositories only and never stores credentials: remove them.");
  }
  if (url.search || url.hash || text.includes("#")) return no("The link has a query (?…) or fragment (#…), which may carry a token; give the plain repository link.");
  const host = url.hostname.toLowerCase().replace(/^\[|\]$/g, "");
  if (!host) return no("The link names no host.");
  const kind = hostKind(host);
  if (kind === "loopback" && !opts.allowLoopback) return no("The link points at the checking machine itself (localhost); give the repository's public link.");
  if (kind === "private") return no("The link points into a private network; give the repository's public link.");
  if (url.pathname === "/" || url.pathname === "") return no("The link names a host but no repository path.");
  const port = url.port ? Number(url.port) : scheme === "https" ? 443 : 80;
  return { ok: true, url: url.toString(), host, port, scheme };
}

/** A full commit hash: 40 hex digits (SHA-1) or 64 (SHA-256 repositories), lower-cased; short forms cannot be fetched. */
export function checkCommit(raw: string): { ok: true; commit: string } | { ok: false; message: string } {
  const text = raw.trim().toLowerCase();
  if (/^[0-9a-f]{40}$/.test(text) || /^[0-9a-f]{64}$/.test(text)) return { ok: true, commit: text };
  if (/^[0-9a-f]{4,39}$/.test(text)) return { ok: false, message: "Give the full commit hash (40 hex digits; `git rev-parse HEAD` prints it), not a short one." };
  return { ok: false, message: "A commit is 40 hex digits (`git rev-parse HEAD` prints it); branch and tag names are not fixed, so they are not taken." };
}

export type HostKind = "public" | "loopback" | "private" | "name";

/**
 * What an address is, by the IANA special-purpose registries (RFC 6890 and its updates): loopback, private or
 * otherwise not globally reachable ("private" here), public, or a DNS name to resolve first.
 */
export function hostKind(host: string): HostKind {
  const h = host.toLowerCase().replace(/^\[|\]$/g, "");
  if (h === "localhost" || h.endsWith(".localhost")) return "loopback";
  const v4 = ipv4(h);
  if (v4) return ipv4Kind(v4);
  if (h.includes(":")) return ipv6Kind(h);
  return "name";
}

function ipv4(h: string): number[] | null {
  const m = /^(\d{1,3})\.(\d{1,3})\.(\d{1,3})\.(\d{1,3})$/.exec(h);
  if (!m) return null;
  const parts = m.slice(1).map(Number);
  return parts.every((p) => p <= 255) ? parts : null;
}

function ipv4Kind([a, b, c]: number[]): HostKind {
  if (a === 127) return "loopback";
  const notGlobal =
    a === 0 || a === 10 || (a === 100 && b >= 64 && b <= 127) || (a === 169 && b === 254) || (a === 172 && b >= 16 && b <= 31) ||
    (a === 192 && b === 0 && (c === 0 || c === 2)) || (a === 192 && b === 168) || (a === 198 && (b === 18 || b === 19)) ||
    (a === 198 && b === 51 && c === 100) || (a === 203 && b === 0 && c === 113) || a >= 224;
  return notGlobal ? "private" : "public";
}

function ipv6Kind(h: string): HostKind {
  const groups = expandIpv6(h);
  if (!groups) return "private"; // not readable as IPv6: never fetched
  if (groups.slice(0, 7).every((g) => g === 0) && groups[7] === 1) return "loopback"; // ::1
  if (groups.every((g) => g === 0)) return "private"; // ::
  if (groups.slice(0, 5).every((g) => g === 0) && groups[5] === 0xffff) {
    // ::ffff:a.b.c.d, an IPv4-mapped address: the IPv4 rules apply
    return ipv4Kind([groups[6] >> 8, groups[6] & 255, groups[7] >> 8, groups[7] & 255]);
  }
  const first = groups[0];
  if ((first & 0xfe00) === 0xfc00 || (first & 0xffc0) === 0xfe80 || (first & 0xff00) === 0xff00) return "private"; // fc00::/7, fe80::/10, ff00::/8
  if (first === 0x2001 && groups[1] === 0x0db8) return "private"; // documentation 2001:db8::/32
  if (first === 0x0064 && groups[1] === 0xff9b) return "private"; // NAT64 64:ff9b::/96 reaches IPv4 hosts, possibly private ones
  return "public";
}

function expandIpv6(h: string): number[] | null {
  let text = h.split("%")[0];
  const tail = /(\d+\.\d+\.\d+\.\d+)$/.exec(text);
  if (tail) {
    const v4 = ipv4(tail[1]);
    if (!v4) return null;
    text = text.slice(0, -tail[1].length) + `${((v4[0] << 8) | v4[1]).toString(16)}:${((v4[2] << 8) | v4[3]).toString(16)}`;
  }
  const halves = text.split("::");
  if (halves.length > 2) return null;
  const parse = (s: string) => (s ? s.split(":").map((g) => (/^[0-9a-f]{1,4}$/.test(g) ? parseInt(g, 16) : NaN)) : []);
  const head = parse(halves[0]);
  const rest = halves.length === 2 ? parse(halves[1]) : [];
  const missing = 8 - head.length - rest.length;
  if (halves.length === 1 ? head.length !== 8 : missing < 1) return null;
  const groups = [...head, ...Array(halves.length === 2 ? missing : 0).fill(0), ...rest];
  return groups.some(Number.isNaN) ? null : groups;
}
