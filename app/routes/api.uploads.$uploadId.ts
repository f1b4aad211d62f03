import { apiNotFound, parseJsonBody, requireApiUser, requireMethod } from "~/api/json.server";
import { apiCall } from "~/errors/http.server";
import { okJson, uploadActionSchema } from "~/entries/api.server";
import { pendingUploadFiles } from "~/entries/multipart.server";
import { uploadForUploader } from "~/entries/upload-access.server";
import { abandonUpload, completeUpload } from "~/entries/uploads.server";
import type { Route } from "./+types/api.uploads.$uploadId";

/** GET: an upload's state and files (to resume). POST {action: complete | abandon}. Crew members only; others get 404. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const user = await requireApiUser(context);
  const up = await uploadForUploader(params.uploadId, user.id);
  if (!up) apiNotFound("That upload");
  return okJson({ uploadId: up.upload.id, entryId: up.entry.id, state: up.upload.state, files: await pendingUploadFiles(up.upload.id) });
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireApiUser(context);
  requireMethod(request, ["POST"]);
  const up = await uploadForUploader(params.uploadId, user.id);
  if (!up) apiNotFound("That upload");
  const body = await parseJsonBody(request, uploadActionSchema);
  if (body.action === "abandon") return okJson({ abandoned: await abandonUpload(up.upload.id) });
  const out = await apiCall(() => completeUpload(up.upload.id, user.id));
  return okJson({ ...out.upload, already: out.already });
}
