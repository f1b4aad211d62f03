import { Form, NavLink } from "react-router";
import { LogoMark } from "./LogoMark";

export interface NavUser {
  name: string;
  email: string;
  isAdmin: boolean;
  organizes: boolean;
  judges: boolean;
  inCrew: boolean;
}

const linkClass = ({ isActive }: { isActive: boolean }) =>
  `rounded-md px-3 py-2 text-sm font-medium ${isActive ? "bg-ink text-paper" : "text-ink-soft hover:bg-line/60"}`;

export function NavBar({ user }: { user: NavUser | null }) {
  const links: { to: string; label: string }[] = [{ to: "/events", label: "Compos" }];
  if (user) links.push({ to: "/my/entries", label: "My entries" });
  if (user?.judges) links.push({ to: "/judging", label: "Judging" });
  if (user?.organizes || user?.isAdmin) links.push({ to: "/organize", label: "Organize" });
  if (user?.isAdmin) links.push({ to: "/admin", label: "Admin" });
  return (
    <header className="border-b border-line bg-card/80 backdrop-blur">
      <nav aria-label="Main" className="mx-auto flex max-w-6xl flex-wrap items-center gap-2 px-4 py-3">
        <NavLink to="/" className="mr-4 flex items-center gap-2 font-extrabold tracking-wide text-ink" aria-label="Gatecrash home">
          <LogoMark />
          <span>GATECRASH</span>
        </NavLink>
        <ul className="flex flex-wrap gap-1">
          {links.map((l) => (
            <li key={l.to}>
              <NavLink to={l.to} className={linkClass}>
                {l.label}
              </NavLink>
            </li>
          ))}
        </ul>
        <div className="ml-auto flex items-center gap-3">
          {user ? (
            <>
              <span className="hidden text-sm text-mute sm:inline" data-testid="signed-in-as">
                {user.name}
              </span>
              <Form method="post" action="/sign-out">
                <button type="submit" className="btn-quiet">
                  Sign out
                </button>
              </Form>
            </>
          ) : (
            <>
              <NavLink to="/sign-in" className="btn-quiet">
                Sign in
              </NavLink>
              <NavLink to="/sign-up" className="btn-primary">
                Create account
              </NavLink>
            </>
          )}
        </div>
      </nav>
    </header>
  );
}
