import { apiNotFound, parseJsonBody, requireApiUser, requireMethod } from "~/api/json.server";
import { apiCall } from "~/errors/http.server";
import { fileActionSchema, okJson } from "~/entries/api.server";
import { rulesetOf } from "~/entries/service.server";
import { confirmFile, recordPart, signParts, storedParts } from "~/entries/multipart.server";
import { fileForUploader } from "~/entries/upload-access.server";
import type { Route } from "./+types/api.uploads.$uploadId.files.$fileId";

/**
 * GET: the parts S3 already holds (resume). POST {action: "sign", partNumbers} → presigned part URLs;
 * POST {action: "part", partNumber, etag, size} → records a part S3 accepted; POST {action: "confirm"} → assemble and confirm the object (size, sniffed type, SHA-256). Crew members only.
 */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireApiUser(context);
  const f = await fileForUploader(params.uploadId, params.fileId, user.id);
  if (!f) apiNotFound("That file");
  return okJson({ id: f.file.id, state: f.file.state, rejectReason: f.file.rejectReason, parts: await storedParts(f.file) });
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireApiUser(context);
  requireMethod(request, ["POST"]);
  const f = await fileForUploader(params.uploadId, params.fileId, user.id);
  if (!f) apiNotFound("That file");
  const body = await parseJsonBody(request, fileActionSchema);
  if (body.action === "sign") {
    const out = await apiCall(() => signParts(f.file, body.partNumbers));
    return okJson({ urls: out.urls });
  }
  if (body.action === "part") {
    const out = await apiCall(() => recordPart(f.file, body));
    return okJson({ recorded: out.recorded });
  }
  const out = await apiCall(() => confirmFile(f.file, rulesetOf(f.competition.ruleset)));
  return okJson({ file: out.file });
}
