import type { Finding } from "~/rules/findings";
import type { Ruleset } from "~/rules/ruleset";
import { fetchRepository, RepositoryError, type Submodule } from "./repository.server";

/** The pipeline's repository step: fetch the commit and say what happened as findings (kept apart from the pipeline). */
export interface RepositoryStepResult {
  findings: Finding[];
  figures: { url: string; commit: string; transferredBytes: number | null; submodules: Submodule[] };
  /** The tree as a .tar.gz for the intake, or null when the fetch was refused. */
  archivePath: string | null;
}

export async function fetchRepositoryStep(
  repo: { url: string; commit: string; allowLoopback: boolean },
  ruleset: Ruleset,
  workDir: string,
): Promise<RepositoryStepResult> {
  const { repository: rules } = ruleset;
  const figures: RepositoryStepResult["figures"] = { url: repo.url, commit: repo.commit, transferredBytes: null, submodules: [] };
  try {
    const fetched = await fetchRepository({ ...repo, workDir, transferBytes: rules.transferBytes, fetchSeconds: rules.fetchSeconds, submodules: rules.submodules });
    figures.transferredBytes = fetched.transferredBytes;
    figures.submodules = fetched.submodules;
    const findings: Finding[] = [
      {
        step: "intake",
        rule: "intake.repository",
        verdict: "pass",
        title: "The commit was fetched from the repository",
        measured: `${fetched.commit} (${fetched.transferredBytes} bytes)`,
        limit: `${rules.transferBytes} bytes, ${rules.fetchSeconds} s`,
        evidence: repo.url,
      },
    ];
    const left = fetched.submodules.filter((s) => !s.fetched);
    if (left.length) {
      findings.push({
        step: "intake",
        rule: "intake.repository.submodules",
        verdict: "warn",
        title: "Submodules are not part of the entry",
        measured: left.map((s) => `${s.path} → ${s.url} @ ${s.commit.slice(0, 12)}`).join("; "),
        limit: "this compo does not fetch submodules",
        advice: "Put every file the design needs into the repository itself (or ask the organizer to allow submodules).",
      });
    }
    return { findings, figures, archivePath: fetched.archivePath };
  } catch (e) {
    if (!(e instanceof RepositoryError)) throw e;
    return {
      findings: [{ step: "intake", rule: `intake.repository.${e.code}`, verdict: "fail", title: "The repository could not be fetched", measured: repo.commit, evidence: e.message, advice: "Fix the link or the commit and upload again, or upload a source bundle instead." }],
      figures,
      archivePath: null,
    };
  }
}
