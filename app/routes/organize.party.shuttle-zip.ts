import { data } from "react-router";
import { audit } from "~/audit/log.server";
import { ShuttleError, shuttleExport } from "~/archive/shuttle.server";
import { ArchiveIntegrityError, zipResponse } from "~/archive/zip-stream.server";
import { requireEventRole } from "~/competitions/access.server";
import type { Route } from "./+types/organize.party.shuttle-zip";

/** The chosen entries' layouts and the shuttle manifest as a zip: …/shuttle.zip?entry=ID&entry=ID. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { user, event } = await requireEventRole(request, context, params.eventId, "organizer");
  const ids = new URL(request.url).searchParams.getAll("entry");
  try {
    await audit({ actorUserId: user.id, eventId: event.id, action: "shuttle.requested", subjectType: "event", subjectId: event.id, details: { entryIds: ids } });
    // Nothing awaits between the zip's start and the response that carries it.
    const out = await shuttleExport(event.id, ids);
    return zipResponse(out.zip, out.filename);
  } catch (e) {
    if (e instanceof ShuttleError) throw data({ message: e.message }, { status: 400 });
    if (e instanceof ArchiveIntegrityError) throw data({ message: e.message }, { status: 409 });
    throw e;
  }
}
