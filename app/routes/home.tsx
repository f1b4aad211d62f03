import { Link } from "react-router";
import { getSession } from "~/auth/guards.server";
import { competitionsOfEvents, publicCompetitions } from "~/competitions/listing.server";
import { CompetitionList } from "~/components/CompetitionList";
import { roleSummary } from "~/users/summary.server";
import type { Route } from "./+types/home";

export const meta: Route.MetaFunction = () => [
  { title: "Gatecrash · tiny-silicon demo compos" },
  { name: "description", content: "Enter, check and judge Verilog demos that race the beam on a shared chip." },
];

export async function loader({ request, context }: Route.LoaderArgs) {
  const session = await getSession(context);
  const open = await publicCompetitions();
  if (!session) return { signedIn: false as const, open };
  const roles = await roleSummary(session.user);
  const organizing = await competitionsOfEvents(roles.organizerOf.map((e) => e.id));
  const judging = (await competitionsOfEvents(roles.judgeOf.map((e) => e.id))).filter((c) => c.state === "judging" || c.state === "closed");
  return { signedIn: true as const, name: session.user.name, open, roles, organizing, judging };
}

export default function Home({ loaderData: d }: Route.ComponentProps) {
  if (!d.signedIn)
    return (
      <div>
        <section className="py-8">
          <p className="kicker">Tiny silicon · racing the beam</p>
          <h1 className="mt-2 max-w-3xl text-5xl font-extrabold leading-tight">Demo compos where every entry is a piece of hardware.</h1>
          <p className="mt-4 max-w-2xl text-lg text-ink-soft">
            Crews write a few thousand gates of Verilog that paint 640×480 VGA and play 1-bit sound with no CPU, no RAM
            and no frame buffer. Gatecrash takes the entries, checks them against the compo's rules within seconds,
            simulates every design the same way for the jury, and runs the audience vote.
          </p>
          <div className="mt-6 flex gap-3">
            <Link to="/sign-up" className="btn-signal">
              Enter a compo
            </Link>
            <Link to="/events" className="btn-quiet">
              Watch the showcase
            </Link>
          </div>
        </section>
        <h2 className="mb-3 mt-6 text-xl font-bold">Compos</h2>
        <CompetitionList items={d.open} linkTo={(c) => `/e/${c.eventSlug}/${c.slug}`} />
      </div>
    );
  const { roles } = d;
  const isEntrant = roles.crews.length > 0;
  const isAudience = !isEntrant && roles.judgeOf.length === 0 && roles.organizerOf.length === 0 && !roles.isAdmin;
  return (
    <div className="space-y-10">
      <h1 className="text-display font-extrabold">Hello, {d.name}</h1>
      {(roles.organizerOf.length > 0 || roles.isAdmin) && (
        <section data-testid="home-organizer">
          <h2 className="mb-3 text-xl font-bold">Compos you organize</h2>
          <CompetitionList items={d.organizing} linkTo={(c) => `/organize/${c.id}`} />
        </section>
      )}
      {roles.judgeOf.length > 0 && (
        <section data-testid="home-judge">
          <h2 className="mb-3 text-xl font-bold">Waiting for your scores</h2>
          <CompetitionList items={d.judging} linkTo={(c) => `/judging/${c.id}`} />
        </section>
      )}
      {isEntrant && (
        <section data-testid="home-entrant">
          <h2 className="mb-3 text-xl font-bold">Your crews</h2>
          <ul className="flex flex-wrap gap-2">
            {roles.crews.map((c) => (
              <li key={c.id} className="card py-3">
                <span className="font-semibold">{c.name}</span> <span className="text-mute">@{c.handle}</span>
              </li>
            ))}
          </ul>
          <Link to="/my/entries" className="btn-primary mt-4">
            My entries
          </Link>
        </section>
      )}
      <section data-testid={isAudience ? "home-audience" : "home-compos"}>
        <h2 className="mb-3 text-xl font-bold">{isAudience ? "Watch and vote" : "All compos"}</h2>
        <CompetitionList items={d.open} linkTo={(c) => `/e/${c.eventSlug}/${c.slug}`} />
      </section>
    </div>
  );
}

export { RouteErrorBoundary as ErrorBoundary } from "~/components/RouteErrorBoundary";
