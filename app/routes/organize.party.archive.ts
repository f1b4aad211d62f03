import { requireOrganizerEvent } from "~/competitions/access.server";
import { audit } from "~/audit/log.server";
import { partyArchive } from "~/archive/party-archive.server";
import { zipResponse } from "~/archive/zip-stream.server";
import type { Route } from "./+types/organize.party.archive";

/** The party archive as a zip, streamed while it is written. Organizers only. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const { user, event } = await requireOrganizerEvent(request, params.eventId);
  const archive = (await partyArchive(event.id))!;
  await audit({ actorUserId: user.id, eventId: event.id, action: "archive.downloaded", subjectType: "event", subjectId: event.id, details: { entries: archive.plan.entries.length } });
  return zipResponse(archive.zip, archive.filename);
}
