import { requireEventRole } from "~/competitions/access.server";
import { audit } from "~/audit/log.server";
import { partyArchive } from "~/archive/party-archive.server";
import { ArchiveIntegrityError, zipResponse } from "~/archive/zip-stream.server";
import { data } from "react-router";
import type { Route } from "./+types/organize.party.archive";

/** The party archive as a zip, streamed while it is written. Organizers only. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { user, event } = await requireEventRole(request, context, params.eventId, "organizer");
  await audit({ actorUserId: user.id, eventId: event.id, action: "archive.requested", subjectType: "event", subjectId: event.id, details: {} });
  const archive = await partyArchive(event.id).catch((e: unknown) => {
    if (e instanceof ArchiveIntegrityError) throw data({ message: e.message }, { status: 409 });
    throw e;
  });
  if (!archive) throw data({ message: "There is no such party." }, { status: 404 });
  return zipResponse(archive.zip, archive.filename);
}
