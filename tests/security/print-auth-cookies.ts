/** Prints the Set-Cookie headers of a server-side sign-in as JSON (run in its own process with its own APP_URL). */
import { auth } from "~/auth/auth.server";

const res = await auth().api.signInEmail({ body: { email: process.env.PROBE_EMAIL ?? "", password: process.env.PROBE_PASSWORD ?? "" }, asResponse: true });
console.log(JSON.stringify({ status: res.status, cookies: res.headers.getSetCookie() }));
process.exit(0);
