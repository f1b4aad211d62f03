import { useEffect, useState } from "react";
import { data, Link } from "react-router";
import { acceptanceWindow, expectedRates } from "~/rules/monitor";
import { VIDEO_MODES } from "~/rules/video-modes";
import { formatFee } from "~/competitions/forms";
import { cutoffOf } from "~/entries/deadline";
import { publicCompetition } from "~/competitions/public.server";
import { formatInZone } from "~/competitions/zone-format";
import { TileShapes } from "~/competitions/ui/TileShapes";
import { StateBadge } from "~/components/StateBadge";
import type { Route } from "./+types/e.$eventSlug.$competitionSlug";

export const meta: Route.MetaFunction = ({ data }) =>
  data ? [{ title: `${data.competition.title} · ${data.event.title} · Gatecrash` }, { name: "description", content: `Rules of ${data.competition.title}: pins, tile, video timing, deadline and fee.` }] : [{ title: "Compo · Gatecrash" }];

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const found = await publicCompetition(context, params.eventSlug, params.competitionSlug);
  if (!found) throw data({ message: "No such compo, or it is not public yet." }, { status: 404 });
  const { competition: c, event: e, ruleset, criteria, preview } = found;
  const iso = (d: Date | null) => d?.toISOString() ?? null;
  return {
    preview,
    event: { slug: e.slug, title: e.title, venue: e.venue, timeZone: e.timeZone },
    competition: {
      slug: c.slug,
      title: c.title,
      description: c.description,
      state: c.state,
      deadlineAt: iso(c.deadlineAt),
      uploadsStopAt: iso(cutoffOf(c.deadlineAt, c.graceMinutes)),
      graceMinutes: c.graceMinutes,
      votingOpensAt: iso(c.votingOpensAt),
      votingClosesAt: iso(c.votingClosesAt),
      fee: formatFee(c.feeAmount, c.feeCurrency),
      free: c.feeAmount === 0,
      rulesetVersion: c.rulesetVersion,
    },
    ruleset,
    videoMode: VIDEO_MODES[ruleset.videoMode] ?? null,
    monitor: ruleset.videoMode in VIDEO_MODES ? { window: acceptanceWindow(ruleset), rates: expectedRates(ruleset).nominal } : null,
    criteria: criteria.map((k) => ({ name: k.name, weight: k.weight, scaleMin: k.scaleMin, scaleMax: k.scaleMax })),
  };
}

/** The visitor's own clock, known only in the browser: filled in after hydration. */
function VisitorTime({ iso }: { iso: string }) {
  const [text, setText] = useState<string | null>(null);
  useEffect(() => {
    const tz = Intl.DateTimeFormat().resolvedOptions().timeZone;
    setText(`${new Intl.DateTimeFormat(undefined, { day: "numeric", month: "short", year: "numeric", hour: "2-digit", minute: "2-digit", timeZoneName: "short" }).format(new Date(iso))} (${tz}, your clock)`);
  }, [iso]);
  if (!text) return null;
  return (
    <span className="block text-sm text-ink-soft" data-testid="visitor-time">
      {text}
    </span>
  );
}

function When({ iso, tz }: { iso: string | null; tz: string }) {
  if (!iso) return <span className="text-mute">not set</span>;
  return (
    <>
      <time dateTime={iso} className="block font-semibold">
        {formatInZone(iso, tz)}
      </time>
      <VisitorTime iso={iso} />
    </>
  );
}

const mib = (b: number) => `${Math.round((b / 1024 / 1024) * 10) / 10} MiB`;

export default function CompetitionRules({ loaderData }: Route.ComponentProps) {
  const { event, competition: c, ruleset: r, videoMode: vm, monitor, criteria, preview } = loaderData;
  const base = `/e/${event.slug}/${c.slug}`;
  const colours = 2 ** (3 * r.colourBitsPerChannel);
  return (
    <article data-testid="rules-page">
      {preview && (
        <p role="note" className="mb-4 rounded-md border border-warn bg-warn-soft px-3 py-2 text-sm font-medium text-warn">
          Draft preview: only the event's organizers see this page until the compo opens.
        </p>
      )}
      <p className="kicker">
        <Link to={`/e/${event.slug}`} title="The party: every compo, the timetable and the awards">
          {event.title}
        </Link>
      </p>
      <div className="mt-1 flex flex-wrap items-center gap-3">
        <h1 className="text-display font-extrabold">{c.title}</h1>
        <StateBadge state={c.state} />
      </div>
      {c.description && <p className="mt-3 max-w-3xl whitespace-pre-line text-ink-soft">{c.description}</p>}

      <div className="mt-5 flex flex-wrap gap-3">
        {c.state === "open" && (
          <Link to={`${base}/enter`} className="btn-signal">
            Enter this compo
          </Link>
        )}
        <Link to={`${base}/showcase`} className="btn-quiet">
          Showcase
        </Link>
        <Link to={`${base}/results`} className="btn-quiet">
          Results
        </Link>
        <a href={`${base}/calendar.ics`} className="btn-quiet" download>
          Add dates to your calendar (.ics)
        </a>
      </div>

      <section className="card mt-6" aria-labelledby="start-h" data-testid="starter-downloads">
        <h2 id="start-h" className="mb-2 text-xl font-bold">
          Start from something that passes
        </h2>
        <p className="text-sm text-ink-soft">
          The starter bundle is written from these rules: a minimal design with this compo's top module <code className="font-mono">{r.topModule}</code>, its pins and its
          video timing, a self-checking testbench, and the one-line local check in its README. The ruleset is the same rules as JSON, every default filled in.
        </p>
        <div className="mt-3 flex flex-wrap gap-3">
          <a href={`${base}/starter.zip`} className="btn-primary" download>
            Starter bundle (.zip)
          </a>
          <a href={`${base}/ruleset.json`} className="btn-quiet" download>
            Ruleset (JSON, version {c.rulesetVersion})
          </a>
        </div>
      </section>

      <div className="mt-6 grid gap-4 md:grid-cols-3">
        <section className="card" aria-labelledby="deadline-h">
          <h2 id="deadline-h" className="kicker">
            Deadline
          </h2>
          <div className="mt-2">
            <When iso={c.deadlineAt} tz={event.timeZone} />
          </div>
          {c.graceMinutes > 0 && c.uploadsStopAt && <p className="mt-2 text-xs text-mute">Uploads that finish within {c.graceMinutes} minutes after it still count.</p>}
        </section>
        <section className="card" aria-labelledby="voting-h">
          <h2 id="voting-h" className="kicker">
            Audience voting
          </h2>
          <div className="mt-2 space-y-1">
            {c.votingOpensAt ? (
              <>
                <span className="text-xs text-mute">opens</span>
                <When iso={c.votingOpensAt} tz={event.timeZone} />
                <span className="text-xs text-mute">closes</span>
                <When iso={c.votingClosesAt} tz={event.timeZone} />
              </>
            ) : (
              <span className="text-mute">to be announced</span>
            )}
          </div>
        </section>
        <section className="card" aria-labelledby="fee-h">
          <h2 id="fee-h" className="kicker">
            Entry fee
          </h2>
          <p className="mt-2 text-2xl font-extrabold" data-testid="fee">
            {c.fee}
          </p>
          <p className="mt-2 text-xs text-mute">Fees, refunds, taxes and prize rules follow local law; Gatecrash gives no legal advice.</p>
        </section>
      </div>

      <section className="card mt-6" aria-labelledby="pins-h">
        <h2 id="pins-h" className="mb-1 text-xl font-bold">
          Top module <code className="font-mono text-signal">{r.topModule}</code> and its pins
        </h2>
        <p className="mb-3 text-sm text-mute">Your top module must have exactly these ports. Reset is active {r.resetActive}.</p>
        <table className="w-full max-w-2xl text-left text-sm" data-testid="pin-table">
          <thead className="text-mute">
            <tr>
              <th scope="col" className="py-1 font-medium">Pin</th>
              <th scope="col" className="py-1 font-medium">Direction</th>
              <th scope="col" className="py-1 font-medium">Width</th>
              <th scope="col" className="py-1 font-medium">Role</th>
            </tr>
          </thead>
          <tbody>
            {r.pins.map((p) => (
              <tr key={p.name} className="border-t border-line">
                <td className="py-1 font-mono">{p.name}</td>
                <td className="py-1">{p.direction}</td>
                <td className="py-1">{p.width === 1 ? "1 bit" : `${p.width} bits`}</td>
                <td className="py-1">{p.role}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>

      <section className="card mt-6" aria-labelledby="tile-h">
        <h2 id="tile-h" className="mb-3 text-xl font-bold">
          Tile budget
        </h2>
        <TileShapes tile={r.tile} />
        <p className="mt-3 text-sm text-ink-soft">
          Pin labels go on GDSII layer {r.pinLayer.layer}
          {r.pinLayer.datatype != null ? `/${r.pinLayer.datatype}` : ""}, on the die edge (within {r.pinLayer.edgeToleranceUm} µm).
        </p>
      </section>

      <div className="mt-6 grid gap-4 md:grid-cols-2">
        <section className="card" aria-labelledby="video-h">
          <h2 id="video-h" className="mb-3 text-xl font-bold">
            Video: {vm?.label ?? r.videoMode}
          </h2>
          {vm && (
            <table className="w-full text-left text-sm" data-testid="video-timing">
              <thead className="text-mute">
                <tr>
                  <th scope="col" className="py-1 font-medium" />
                  <th scope="col" className="py-1 pr-3 font-medium">Active</th>
                  <th scope="col" className="py-1 pr-3 font-medium">Front porch</th>
                  <th scope="col" className="py-1 pr-3 font-medium">Sync</th>
                  <th scope="col" className="py-1 pr-3 font-medium">Back porch</th>
                  <th scope="col" className="py-1 pr-3 font-medium">Total</th>
                  <th scope="col" className="py-1 font-medium">Sync polarity</th>
                </tr>
              </thead>
              <tbody>
                {(["h", "v"] as const).map((axis) => (
                  <tr key={axis} className="border-t border-line">
                    <th scope="row" className="py-1 pr-3 text-left font-medium">
                      {axis === "h" ? "Horizontal (pixels)" : "Vertical (lines)"}
                    </th>
                    <td className="py-1 pr-3">{vm[axis].active}</td>
                    <td className="py-1 pr-3">{vm[axis].frontPorch}</td>
                    <td className="py-1 pr-3">{vm[axis].sync}</td>
                    <td className="py-1 pr-3">{vm[axis].backPorch}</td>
                    <td className="py-1 pr-3">{vm[axis].total}</td>
                    <td className="py-1">{vm[axis].syncPolarity}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
          <p className="mt-3 text-sm text-ink-soft">
            {r.colourBitsPerChannel} bit{r.colourBitsPerChannel === 1 ? "" : "s"} per colour channel: {colours} colours.
          </p>
        </section>
        <section className="card" aria-labelledby="clock-h">
          <h2 id="clock-h" className="mb-3 text-xl font-bold">
            Clock and audio
          </h2>
          <p className="text-sm" data-testid="board-clock">
            Board clock <strong>{(r.clock.frequencyHz / 1e6).toFixed(3)} MHz</strong> ± {r.clock.tolerancePct}%,{" "}
            <strong>{r.clock.clocksPerPixel} clock{r.clock.clocksPerPixel === 1 ? "" : "s"} per pixel</strong> — one pixel lasts about{" "}
            {((1e9 * r.clock.clocksPerPixel) / r.clock.frequencyHz).toFixed(1)} ns{vm && r.clock.clocksPerPixel > 1 ? `, a line ${vm.h.total * r.clock.clocksPerPixel} clocks` : ""}.
          </p>
          {monitor && vm && (
            <p className="mt-2 text-sm" data-testid="monitor-window">
              A design that follows the mode draws lines at {monitor.rates.lineRateKHz.toFixed(3)} kHz and frames at {monitor.rates.refreshHz.toFixed(3)} Hz on this
              clock. The monitor window is <strong>{monitor.window.lineRateKHz.min}–{monitor.window.lineRateKHz.max} kHz</strong> and{" "}
              <strong>{monitor.window.refreshHz.min}–{monitor.window.refreshHz.max} Hz</strong>
              {monitor.window.source === "mode" ? " (the usual window for this mode: common practice, not a published standard)" : " (set by the organizers)"}; the
              VESA DMT reference is {vm.dmt.lineRateKHz} kHz and {vm.dmt.refreshHz} Hz at {(vm.pixelClockHz / 1e6).toFixed(3)} MHz.
            </p>
          )}
          <p className="mt-2 text-sm">Audio is 1-bit PWM on the audio pin, filtered by an external RC network.</p>
          <p className="mt-2 rounded-md bg-warn-soft px-3 py-2 text-xs text-warn">
            A 1-bit PWM pin is a full-scale square wave with a DC offset: listen through a low-pass filter and a coupling capacitor, and start at low volume.
          </p>
        </section>
      </div>

      <section className="card mt-6" aria-labelledby="limits-h">
        <h2 id="limits-h" className="mb-3 text-xl font-bold">
          Limits and checks
        </h2>
        <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-2 lg:grid-cols-3">
          <div>
            <dt className="text-mute">Flip-flop budget</dt>
            <dd className="font-semibold">{r.flipFlopBudget ?? "no fixed budget"}</dd>
          </div>
          <div>
            <dt className="text-mute">Flip-flop cells are named like</dt>
            <dd className="font-mono text-xs">{r.flipFlopPattern}</dd>
          </div>
          <div>
            <dt className="text-mute">Forbidden cells (memories, macros)</dt>
            <dd className="font-mono text-xs">{r.forbiddenCellPatterns.length ? r.forbiddenCellPatterns.join("  ·  ") : "none"}</dd>
          </div>
          <div>
            <dt className="text-mute">Source bundle</dt>
            <dd className="font-semibold">
              {mib(r.uploadLimits.bundleBytes)} (unpacked {mib(r.uploadLimits.bundleUnpackedBytes)}, {r.uploadLimits.bundleFiles} files)
            </dd>
          </div>
          <div>
            <dt className="text-mute">Layout (GDSII)</dt>
            <dd className="font-semibold">{mib(r.uploadLimits.layoutBytes)}</dd>
          </div>
          <div>
            <dt className="text-mute">Capture video / still</dt>
            <dd className="font-semibold">
              {mib(r.uploadLimits.videoBytes)} / {mib(r.uploadLimits.stillBytes)}
            </dd>
          </div>
          <div>
            <dt className="text-mute">Simulation</dt>
            <dd className="font-semibold">
              {r.simulation.frames === null
                ? `the whole demo from reset, until it loops (at most ${r.simulation.maxRunSeconds} s)`
                : `${r.simulation.frames} frame${r.simulation.frames === 1 ? "" : "s"} from reset`}
            </dd>
          </div>
          <div>
            <dt className="text-mute">Flash check</dt>
            <dd className="font-semibold">
              {r.flashCheck.enabled ? (r.flashCheck.action === "block" ? "on; flashing entries fail" : "on; flashing entries carry a warning") : "off"}
              {r.flashCheck.enabled &&
                (r.flashCheck.viewing === "hall"
                  ? " · watched in a hall: WCAG's area exemption does not apply, a flash anywhere on the screen counts"
                  : " · watched at a desk: WCAG's 10° field area rule applies")}
            </dd>
          </div>
          <div>
            <dt className="text-mute">Audio</dt>
            <dd className="font-semibold">the PWM pin through a first-order RC low-pass at {r.audio.lowPassHz} Hz</dd>
          </div>
          <div>
            <dt className="text-mute">Layout against source</dt>
            <dd className="font-semibold">flip-flops within {r.layoutMatch.flipFlopTolerancePct} % of synthesis; pin labels = top-level ports; top cell {r.topModule}</dd>
          </div>
          <div>
            <dt className="text-mute">Layout file</dt>
            <dd className="font-semibold">.gds, or .gds.gz held to the same size once inflated</dd>
          </div>
          <div>
            <dt className="text-mute">Sources by repository link</dt>
            <dd className="font-semibold">
              {r.repository.allowed
                ? `yes: one commit, ${r.repository.submodules ? "with" : "without"} submodules, at most ${mib(r.repository.transferBytes)} in ${r.repository.fetchSeconds} s`
                : "no; bundle files only"}
            </dd>
          </div>
          <div>
            <dt className="text-mute">Licence (SPDX)</dt>
            <dd className="font-semibold">{r.licence.required ? (r.licence.openOnly ? "required, OSI-approved only" : "required") : r.licence.openOnly ? "optional; OSI-approved only" : "optional"}</dd>
          </div>
          <div>
            <dt className="text-mute">Ruleset version</dt>
            <dd className="font-semibold">{c.rulesetVersion}</dd>
          </div>
        </dl>
        <p className="mt-4 text-xs text-mute">A passing check run does not replace the foundry's or shuttle's own design-rule and layout-versus-schematic checks.</p>
      </section>

      <section className="card mt-6" aria-labelledby="criteria-h">
        <h2 id="criteria-h" className="mb-3 text-xl font-bold">
          How the jury scores
        </h2>
        {criteria.length === 0 ? (
          <p className="text-mute">The criteria are not announced yet.</p>
        ) : (
          <table className="w-full max-w-xl text-left text-sm">
            <thead className="text-mute">
              <tr>
                <th scope="col" className="py-1 font-medium">Criterion</th>
                <th scope="col" className="py-1 font-medium">Weight</th>
                <th scope="col" className="py-1 font-medium">Scale</th>
              </tr>
            </thead>
            <tbody>
              {criteria.map((k) => (
                <tr key={k.name} className="border-t border-line">
                  <td className="py-1 font-semibold">{k.name}</td>
                  <td className="py-1">×{k.weight}</td>
                  <td className="py-1">
                    {k.scaleMin}–{k.scaleMax}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
    </article>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
