import { Form, Link, useNavigation } from "react-router";
import { z } from "zod";
import { readForm } from "~/api/body.server";
import { formatInZone } from "~/competitions/zone-format";
import { requireCompetitionOrganizer } from "~/showcase/organizer.server";
import { STAGE_AUDIO_CAUTION, STAGE_FLASH_CAUTION } from "~/stage/caution";
import { chooseStageSource, runningOrder, signOffFlagged, withdrawSignOff } from "~/stage/running-order.server";
import type { Route } from "./+types/organize.$competitionId.stage";

/** The organizer's running order for the big screen: what plays, what is held back, and the flash sign-offs. */
export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { competition: c } = await requireCompetitionOrganizer(request, context, params.competitionId);
  const order = await runningOrder(c);
  return {
    competition: { id: c.id, title: c.title, eventTitle: c.eventTitle, timeZone: c.timeZone },
    order: order.map((r) => ({
      entryId: r.entryId,
      position: r.position,
      title: r.entry.title,
      chosenSource: r.chosenSource,
      source: r.source,
      reference: r.reference,
      crewVideo: r.crewVideo,
      flash: r.flash,
      flagged: r.flagged,
      signOff: r.signOff,
      onStage: r.onStage,
      ready: r.video !== null,
    })),
  };
}

const stageIntent = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("sign-off"), entryId: z.string(), understood: z.literal("yes", { error: "Tick the box to confirm you have read the warning." }) }),
  z.object({ intent: z.literal("withdraw"), entryId: z.string() }),
  z.object({ intent: z.literal("source"), entryId: z.string(), source: z.enum(["reference", "crew"]) }),
]);

export async function action({ request, params, context }: Route.ActionArgs) {
  const { user, competition: c } = await requireCompetitionOrganizer(request, context, params.competitionId);
  const form = await readForm(request);
  const parsed = stageIntent.safeParse(Object.fromEntries(form));
  if (!parsed.success) return { ok: false as const, entryId: String(form.get("entryId") ?? ""), message: parsed.error.issues[0]?.message ?? "That request was not understood." };
  const v = parsed.data;
  const out =
    v.intent === "sign-off"
      ? await signOffFlagged(c, v.entryId, user.id)
      : v.intent === "withdraw"
        ? await withdrawSignOff(c, v.entryId, user.id)
        : await chooseStageSource(c, v.entryId, v.source, user.id);
  return { ...out, entryId: v.entryId };
}

export const meta: Route.MetaFunction = ({ data }) => [{ title: data ? `Stage running order · ${data.competition.title} · Gatecrash` : "Stage running order · Gatecrash" }];

export default function StageRunningOrder({ loaderData, actionData }: Route.ComponentProps) {
  const { competition: c, order } = loaderData;
  const nav = useNavigation();
  const busy = nav.state !== "idle";
  const heldBack = order.filter((r) => !r.onStage).length;
  return (
    <div>
      <p className="kicker">Organize · {c.eventTitle}</p>
      <h1 className="mt-1 text-display font-extrabold">Stage running order: {c.title}</h1>
      <nav aria-label="Competition tools" className="mt-4 flex flex-wrap gap-2">
        <Link className="btn-quiet" to={`/stage/${c.id}`}>Open stage mode</Link>
      </nav>

      <section role="note" aria-label="Photosensitivity caution" className="mt-6 rounded-md border-2 border-fail bg-fail-soft p-4 text-sm">
        <p className="font-extrabold">Photosensitivity: flagged entries are held back</p>
        <p className="mt-1">{STAGE_FLASH_CAUTION}</p>
        <p className="mt-1">{STAGE_AUDIO_CAUTION}</p>
      </section>

      {actionData && (
        <p role={actionData.ok ? "status" : "alert"} className={`mt-4 text-sm font-semibold ${actionData.ok ? "text-pass" : "text-fail"}`} data-testid="stage-order-message">
          {actionData.message}
        </p>
      )}

      <p className="mt-6 text-sm text-mute">
        {order.length - heldBack} of {order.length} entries go on the big screen{heldBack ? `; ${heldBack} held back by the flash check` : ""}. Each plays its whole file from the start, with sound, at 640×480 scaled by whole pixels.
      </p>
      <ol className="mt-4 grid gap-4" data-testid="stage-order">
        {order.map((r) => (
          <li key={r.entryId} className="card" data-testid={`stage-order-${r.entryId}`} data-on-stage={r.onStage ? "yes" : "no"}>
            <div className="flex flex-wrap items-baseline justify-between gap-2">
              <h2 className="font-extrabold">
                {r.position}. {r.title}
              </h2>
              <span className={`text-sm font-semibold ${r.onStage ? "text-pass" : "text-fail"}`}>
                {!r.onStage ? "Held back (flash check)" : r.flagged ? "On stage, on sign-off, behind a warning slide" : "On stage"}
                {r.ready ? "" : " · capture not ready yet"}
              </span>
            </div>
            <p className="mt-1 text-sm">
              Plays: {r.source === "crew" ? "the crew's own video" : "the reference capture"} — {r.flash.statement}
            </p>
            <Form method="post" className="mt-3 flex flex-wrap items-end gap-2 text-sm">
              <input type="hidden" name="intent" value="source" />
              <input type="hidden" name="entryId" value={r.entryId} />
              <label>
                <span className="block text-xs font-semibold uppercase tracking-wider text-mute">File on stage</span>
                <select name="source" defaultValue={r.chosenSource} className="field">
                  <option value="reference">Reference capture (Gatecrash's own)</option>
                  <option value="crew" disabled={!r.crewVideo.available || r.crewVideo.flash.verdict !== "pass"}>
                    Crew's video{!r.crewVideo.available ? " (none uploaded)" : r.crewVideo.flash.verdict !== "pass" ? " (not allowed: its own flash check did not pass)" : ""}
                  </option>
                </select>
              </label>
              <button type="submit" className="btn-quiet" disabled={busy}>
                Use this file
              </button>
              {r.crewVideo.available && <span className="text-mute">Crew's video: {r.crewVideo.flash.statement}</span>}
            </Form>
            {r.flagged && !r.signOff && (
              <Form method="post" className="mt-3 rounded-md border border-fail p-3 text-sm" data-testid="sign-off-form">
                <input type="hidden" name="intent" value="sign-off" />
                <input type="hidden" name="entryId" value={r.entryId} />
                <label className="flex items-start gap-2">
                  <input type="checkbox" name="understood" value="yes" required />
                  <span>I have read the warning above. Show this entry after a photosensitivity warning slide; record my name and the time in the audit log.</span>
                </label>
                <button type="submit" className="btn-signal mt-2" disabled={busy}>
                  Sign off and show it
                </button>
              </Form>
            )}
            {r.signOff && (
              <Form method="post" className="mt-3 text-sm" data-testid="signed-off">
                <input type="hidden" name="intent" value="withdraw" />
                <input type="hidden" name="entryId" value={r.entryId} />
                Signed off by {r.signOff.by}, {formatInZone(r.signOff.at, c.timeZone)} ({c.timeZone}).{" "}
                <button type="submit" className="underline" disabled={busy}>
                  Withdraw the sign-off
                </button>
              </Form>
            )}
          </li>
        ))}
      </ol>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
