import { apiNotFound, parseJsonBody, requireApiUser, requireMethod } from "~/api/json.server";
import { apiCall } from "~/errors/http.server";
import { okJson, startUploadSchema } from "~/entries/api.server";
import { entryForUploader } from "~/entries/upload-access.server";
import { startUpload } from "~/entries/uploads.server";
import type { Route } from "./+types/api.entries.$entryId.uploads";

/** POST: start an upload of an entry (crew members): claimed files are checked against the ruleset first. */
export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireApiUser(context);
  requireMethod(request, ["POST"]);
  // who may upload is settled before the body is read
  if (!(await entryForUploader(params.entryId, user.id))) apiNotFound("That entry");
  const body = await parseJsonBody(request, startUploadSchema);
  const out = await apiCall(() => startUpload(params.entryId, user.id, body.files, new Date(), { repository: body.repository, licence: body.licence }));
  return okJson({ uploadId: out.uploadId, files: out.files }, 201);
}
