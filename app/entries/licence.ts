import licences from "spdx-license-list";
import parse from "spdx-expression-parse";

/**
 * An upload's licence: an SPDX license expression (SPDX specification 2.3, annex D: "MIT", "CERN-OHL-S-2.0",
 * "MIT OR Apache-2.0", "GPL-2.0-or-later WITH …"), parsed by spdx-expression-parse and held against the SPDX
 * license list (spdx-license-list from npm, which also marks the OSI-approved licences). An organizer may require
 * a licence, and only open ones: an expression counts as open when the licences it lets you choose are all
 * OSI-approved (for OR, one open branch is enough; for AND, every part must be open).
 */
export type LicenceCheck = { ok: true; licence: string | null; open: boolean } | { ok: false; message: string };

type Node = { license: string; plus?: boolean; exception?: string } | { conjunction: "and" | "or"; left: Node; right: Node };

export function checkLicence(raw: string | null | undefined, rules: { required: boolean; openOnly: boolean }): LicenceCheck {
  const text = (raw ?? "").trim();
  if (!text) return rules.required ? { ok: false, message: "This compo asks for the licence of your sources, as an SPDX identifier such as MIT or CERN-OHL-P-2.0." } : { ok: true, licence: null, open: false };
  if (text.length > 200) return { ok: false, message: "A licence expression has at most 200 characters." };
  let tree: Node;
  try {
    tree = parse(text) as Node;
  } catch (e) {
    if (!(e instanceof Error)) throw e;
    return { ok: false, message: `"${text}" is not an SPDX licence identifier or expression (see spdx.org/licenses), e.g. MIT, Apache-2.0, CERN-OHL-W-2.0.` };
  }
  const unknown = ids(tree).filter((id) => !id.startsWith("LicenseRef-") && !(id in licences));
  if (unknown.length) return { ok: false, message: `${unknown.join(", ")} is not on the SPDX licence list.` };
  const open = isOpen(tree);
  if (rules.openOnly && !open) {
    return { ok: false, message: `This compo takes only open source licences (OSI-approved); ${text} is not one. MIT, Apache-2.0, BSD-3-Clause and CERN-OHL-P-2.0 are.` };
  }
  return { ok: true, licence: text, open };
}

function ids(node: Node): string[] {
  return "license" in node ? [node.license] : [...ids(node.left), ...ids(node.right)];
}

function isOpen(node: Node): boolean {
  if ("license" in node) return licences[node.license]?.osiApproved === true;
  return node.conjunction === "or" ? isOpen(node.left) || isOpen(node.right) : isOpen(node.left) && isOpen(node.right);
}

