import { eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { auth } from "~/auth/auth.server";
import { closeDb, db } from "~/db/client.server";
import { outbox } from "~/db/schema";
import { deliverOutboxMail } from "~/mail/outbox.server";
import { stopQueue } from "~/jobs/queue.server";
import * as adminRoute from "~/routes/admin";
import * as apiMe from "~/routes/api.me";
import * as judgingRoute from "~/routes/judging";
import * as myEntries from "~/routes/my.entries";
import * as organizeRoute from "~/routes/organize";
import * as signUp from "~/routes/sign-up";
import * as signIn from "~/routes/sign-in";
import { firstLink, waitForMail } from "../support/mail";
import { callRoute, routeArgs } from "../support/routes";
import { callApi } from "./entries-support";
import { grantEventRole, makeEvent, makeUser, request, sessionCookie, unique } from "../support/users";

afterAll(async () => {
  await stopQueue();
  await closeDb();
});

describe("role guards on loaders", () => {
  it("sends anonymous visitors to sign-in, remembering where they were going", async () => {
    const out = await callRoute(organizeRoute.loader, request("/organize"));
    expect(out.status).toBe(302);
    expect(out.location).toBe("/sign-in?next=%2Forganize");
  });

  it("refuses the wrong role with 403 and lets the right one in", async () => {
    const event = await makeEvent();
    const [organizer, judge, entrant, admin] = await Promise.all([makeUser(), makeUser(), makeUser(), makeUser({ admin: true })]);
    await grantEventRole(event.id, organizer.id, "organizer");
    await grantEventRole(event.id, judge.id, "judge");
    const [co, cj, ce, ca] = await Promise.all([organizer, judge, entrant, admin].map(sessionCookie));

    expect((await callRoute(organizeRoute.loader, request("/organize", { cookie: co }))).status).toBe(200);
    expect((await callRoute(organizeRoute.loader, request("/organize", { cookie: cj }))).status).toBe(403);
    expect((await callRoute(organizeRoute.loader, request("/organize", { cookie: ce }))).status).toBe(403);
    expect((await callRoute(organizeRoute.loader, request("/organize", { cookie: ca }))).status).toBe(200);

    expect((await callRoute(judgingRoute.loader, request("/judging", { cookie: cj }))).status).toBe(200);
    expect((await callRoute(judgingRoute.loader, request("/judging", { cookie: co }))).status).toBe(403);

    expect((await callRoute(adminRoute.loader, request("/admin", { cookie: ca }))).status).toBe(200);
    expect((await callRoute(adminRoute.loader, request("/admin", { cookie: co }))).status).toBe(403);

    expect((await callRoute(myEntries.loader, request("/my/entries", { cookie: ce }))).status).toBe(200);
    expect((await callRoute(myEntries.loader, request("/my/entries"))).status).toBe(302);
  });
});

describe("the JSON API convention", () => {
  it("answers anonymous calls with the one error shape and 401", async () => {
    const out = await callApi(apiMe.loader, request("/api/me"));
    expect(out.status).toBe(401);
    // the whole body, exactly: { error: { status, code, message } } (app/api/json.server.ts), nothing else
    expect(out.body).toEqual({ error: { status: 401, code: "unauthenticated", message: "Sign in first." } });
  });

  it("returns the signed-in user's roles", async () => {
    const u = await makeUser();
    const res = (await apiMe.loader((await routeArgs(request("/api/me", { cookie: await sessionCookie(u) }), {})) as never)) as Response;
    expect(res.status).toBe(200);
    const body = (await res.json()) as { email: string; roles: { isAdmin: boolean } };
    expect(body.email).toBe(u.email);
    expect(body.roles.isAdmin).toBe(false);
  });
});

describe("sign-up, verification mail and sign-in", () => {
  it("keeps the values and shows errors beside the fields on a wrong form", async () => {
    const out = await callRoute<{ error: Record<string, string[]>; initialValue: Record<string, string> }>(
      signUp.action,
      request("/sign-up", { form: { name: "A", email: "not-an-address", password: "short" } }),
    );
    expect(out.status).toBe(200);
    expect(Object.keys(out.data?.error ?? {}).sort()).toEqual(["email", "name", "password"]);
    expect(out.data?.initialValue.email).toBe("not-an-address");
  });

  it("sends a verification mail through the outbox; the link verifies and signs in", async () => {
    const email = `${unique("new")}@example.test`;
    const out = await callRoute(signUp.action, request("/sign-up", { form: { name: "New Crew", email, password: "a-long-password" } }));
    expect(out.status).toBe(302);
    // Unverified accounts cannot sign in yet.
    const early = await callRoute<{ error: Record<string, string[]> }>(signIn.action, request("/sign-in", { form: { email, password: "a-long-password" } }));
    expect(early.status).toBe(200);
    expect(JSON.stringify(early.data)).toMatch(/Confirm your e-mail/);

    const [row] = await db().select().from(outbox).where(eq(outbox.toAddress, email));
    expect(row.subject).toMatch(/Confirm your e-mail/);
    expect(await deliverOutboxMail(row.id)).toBe("sent");
    expect(await deliverOutboxMail(row.id)).toBe("already-sent");
    const mail = await waitForMail(email, /Confirm your e-mail/);
    const link = firstLink(mail);
    const verified = await auth().handler(new Request(link));
    expect([200, 302]).toContain(verified.status);

    const ok = await callRoute(signIn.action, request("/sign-in", { form: { email, password: "a-long-password", next: "/my/entries" } }));
    expect(ok.status).toBe(302);
    expect(ok.location).toBe("/my/entries");
  });
});
