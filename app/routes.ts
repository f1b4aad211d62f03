import { type RouteConfig, index, route } from "@react-router/dev/routes";

export default [
  index("routes/home.tsx"),
  // accounts
  route("sign-in", "routes/sign-in.tsx"),
  route("sign-up", "routes/sign-up.tsx"),
  route("sign-out", "routes/sign-out.tsx"),
  route("check-your-mail", "routes/check-your-mail.tsx"),
  route("welcome", "routes/welcome.tsx"),
  route("forgot-password", "routes/forgot-password.tsx"),
  route("reset-password", "routes/reset-password.tsx"),
  // role homes
  route("events", "routes/events.tsx"),
  route("my/entries", "routes/my.entries.tsx"),
  route("judging", "routes/judging.tsx"),
  route("organize", "routes/organize.tsx"),
  route("admin", "routes/admin.tsx"),
  // JSON API
  route("api/auth/*", "routes/api.auth.ts"),
  route("api/me", "routes/api.me.ts"),
  // conformance reports and artifacts (app/conformance)
  route("api/checks/:entryId", "routes/api.checks.$entryId.ts"),
  route("artifacts/:artifactId", "routes/artifacts.$artifactId.ts"),
  // organizer flows and the public rules page (app/competitions)
  route("organize/events/new", "routes/organize.events.new.tsx"),
  route("organize/events/:eventId", "routes/organize.events.$eventId.tsx"),
  route("organize/events/:eventId/competitions/new", "routes/organize.events.$eventId.competitions.new.tsx"),
  // the organizer's compo pages, under one layout with their sub-navigation (entries, judging, audience, results)
  route("organize/:competitionId", "routes/organize.$competitionId._layout.tsx", [
    index("routes/organize.$competitionId.tsx"),
    route("edit", "routes/organize.$competitionId.edit.tsx"),
    route("entries", "routes/organize.$competitionId.entries.tsx"),
    route("entries/:entryId/refund", "routes/organize.$competitionId.entries.$entryId.refund.tsx"),
    route("jury", "routes/organize.$competitionId.jury.tsx"),
    route("standings", "routes/organize.$competitionId.standings.tsx"),
    route("entries/:entryId/history", "routes/organize.$competitionId.entries.$entryId.history.tsx"),
    route("audience", "routes/organize.audience.tsx"),
    route("results", "routes/organize.results.tsx"),
    route("stage", "routes/organize.$competitionId.stage.tsx"),
  ]),
  route("organize/:competitionId/ruleset.json", "routes/organize.$competitionId.ruleset[.]json.ts"),
  route("organize/:competitionId/files/:fileId", "routes/organize.$competitionId.files.$fileId.ts"),
  route("e/:eventSlug/:competitionSlug", "routes/e.$eventSlug.$competitionSlug.tsx"),
  route("e/:eventSlug/:competitionSlug/calendar.ics", "routes/e.$eventSlug.$competitionSlug.calendar[.]ics.ts"),
  route("e/:eventSlug/:competitionSlug/ruleset.json", "routes/e.$eventSlug.$competitionSlug.ruleset[.]json.ts"),
  route("e/:eventSlug/:competitionSlug/starter.zip", "routes/e.$eventSlug.$competitionSlug.starter[.]zip.ts"),
  // end of organizer flows
  // entrant flows: crews, entries, fees, uploads (app/crews, app/entries, app/payments)
  route("crews/new", "routes/crews.new.tsx"),
  route("crews/:crewId", "routes/crews.$crewId.tsx"),
  route("invites/:token", "routes/invites.$token.tsx"),
  route("e/:eventSlug/:competitionSlug/enter", "routes/e.$eventSlug.$competitionSlug.enter.tsx"),
  route("entries/:entryId", "routes/entries.$entryId.tsx"),
  route("api/payments/webhook", "routes/api.payments.webhook.ts"),
  route("api/entries/:entryId/uploads", "routes/api.entries.$entryId.uploads.ts"),
  route("api/uploads/:uploadId", "routes/api.uploads.$uploadId.ts"),
  route("api/uploads/:uploadId/files", "routes/api.uploads.$uploadId.files.ts"),
  route("api/uploads/:uploadId/files/:fileId", "routes/api.uploads.$uploadId.files.$fileId.ts"),
  // end of entrant flows
  // judging: jury, scoring grid, standings (app/judging)
  route("judging/:competitionId", "routes/judging.$competitionId.tsx"),
  route("judging/:competitionId/entries/:entryId", "routes/judging.$competitionId.entries.$entryId.tsx"),
  route("api/judging/:competitionId/scores", "routes/api.judging.$competitionId.scores.ts"),
  route("api/judging/:competitionId/notes", "routes/api.judging.$competitionId.notes.ts"),
  route("judge-invites/:token", "routes/judge-invites.$token.tsx"),
  // showcase, audience vote, results and stage mode
  route("e/:eventSlug/:competitionSlug/showcase", "routes/showcase.tsx"),
  route("e/:eventSlug/:competitionSlug/entries/:entryId", "routes/showcase.entry.tsx"),
  route("e/:eventSlug/:competitionSlug/entries/:entryId/media/:kind", "routes/showcase.media.ts"),
  route("e/:eventSlug/:competitionSlug/vote", "routes/vote.tsx"),
  route("e/:eventSlug/:competitionSlug/results", "routes/results.tsx"),
  route("e/:eventSlug/:competitionSlug/results.csv", "routes/results.csv.ts"),
  route("e/:eventSlug/:competitionSlug/results.txt", "routes/results.txt.ts"),
  route("e/:eventSlug/:competitionSlug/results.json", "routes/results.json.ts"),
  route("e/:eventSlug/:competitionSlug/recount.json", "routes/recount.json.ts"),
  route("api/ballots/:competitionId", "routes/api.ballots.ts"),
  route("organize/:competitionId/audience/codes", "routes/organize.audience.codes.ts"),
  route("organize/:competitionId/audience/codes.csv", "routes/organize.audience.codes-csv.ts"),
  route("stage/:competitionId", "routes/stage.tsx"),
  // end showcase block
  // the party around the compos: public page, timetable, party results; organizer codes, awards, archive (app/party, app/archive)
  route("e/:eventSlug", "routes/party.tsx"),
  route("e/:eventSlug/calendar.ics", "routes/party.calendar[.]ics.ts"),
  route("e/:eventSlug/results.txt", "routes/party.results.ts", { id: "party-results-txt" }),
  route("e/:eventSlug/results.csv", "routes/party.results.ts", { id: "party-results-csv" }),
  route("organize/events/:eventId/party", "routes/organize.events.$eventId.party.tsx"),
  route("organize/events/:eventId/party/codes", "routes/organize.party.codes.ts", { id: "party-codes-sheet" }),
  route("organize/events/:eventId/party/codes.csv", "routes/organize.party.codes.ts", { id: "party-codes-csv" }),
  route("organize/events/:eventId/archive.zip", "routes/organize.party.archive.ts"),
  route("organize/events/:eventId/shuttle", "routes/organize.party.shuttle.tsx"),
  route("organize/events/:eventId/shuttle.zip", "routes/organize.party.shuttle-zip.ts"),
  // end party block
  // everything else
  route("*", "routes/not-found.tsx"),
] satisfies RouteConfig;
