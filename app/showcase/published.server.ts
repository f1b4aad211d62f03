import { createHash } from "node:crypto";
import { sql } from "drizzle-orm";
import { db } from "~/db/client.server";
import { showcaseEntries, type PublicCompetition, type ShowcaseEntry } from "./showcase.server";

/**
 * The showcase as published: once a compo's entries have closed, its public showcase changes only when one of
 * the rows it is made of changes (the compo, its entries and crews, their uploads, check runs, artifacts and
 * public files). One query reads a fingerprint of exactly those rows; the showcase built from them is kept per
 * compo and reused while the fingerprint stays the same, so a request costs that one query instead of the
 * whole assembly. The fingerprint also names the version for HTTP caching (ETag, If-None-Match → 304).
 *
 * What is kept is the public showcase itself (showcaseEntries: only public fields), never a raw row.
 */

export interface PublishedShowcase {
  /** A hash of the public competition and every row its showcase is made of: changes when any of them changes. */
  version: string;
  entries: ShowcaseEntry[];
}

const KEEP = 200; // compos kept per process; a party has a handful
/** Per compo: the version and its showcase, as a promise so that requests arriving together build it once. */
const kept = new Map<string, { version: string; entries: Promise<ShowcaseEntry[]> }>();

/**
 * md5 over the rows (as PostgreSQL prints them) that showcaseEntries reads, in a stable order. A check run's
 * figures go in as their own md5: they grow step by step while a run goes on.
 */
export async function showcaseFingerprint(competitionId: string): Promise<string> {
  const rows = (await db().execute(sql`
    with e as (
      select en.id, en.state, en.title, en.description, en.final_upload_id, en.updated_at, cr.name as crew
      from entries en join crews cr on cr.id = en.crew_id
      where en.competition_id = ${competitionId}
    ), u as (
      select u.id, u.entry_id, u.number, u.state from uploads u where u.entry_id in (select id from e)
    ), r as (
      select r.id, r.upload_id, r.state, r.verdict, r.queued_at, md5(r.figures::text) as figures
      from check_runs r where r.upload_id in (select id from u)
    )
    select md5(concat_ws('|',
      (select c.order_seed from competitions c where c.id = ${competitionId}),
      (select string_agg(e::text, ',' order by e.id) from e),
      (select string_agg(u::text, ',' order by u.id) from u),
      (select string_agg(r::text, ',' order by r.id) from r),
      (select string_agg(a.id::text || a.kind, ',' order by a.id) from artifacts a where a.check_run_id in (select id from r)),
      (select string_agg(f.id::text || f.kind || f.state || coalesce(f.media_type, ''), ',' order by f.id)
         from upload_files f where f.upload_id in (select id from u))
    )) as fingerprint
  `)) as unknown as { fingerprint: string }[];
  return rows[0].fingerprint;
}

/** The showcase of `c` (a competition whose showcase is open), built once per published version. */
export async function publishedShowcase(c: PublicCompetition): Promise<PublishedShowcase> {
  const fingerprint = await showcaseFingerprint(c.id);
  const version = createHash("sha256").update(JSON.stringify(c)).update("\0").update(fingerprint).digest("base64url").slice(0, 32);
  const hit = kept.get(c.id);
  if (hit && hit.version === version) {
    // Most recently used last, so the oldest compo is the one dropped.
    kept.delete(c.id);
    kept.set(c.id, hit);
    return { version, entries: await hit.entries };
  }
  const made = { version, entries: showcaseEntries(c) };
  kept.delete(c.id);
  kept.set(c.id, made);
  if (kept.size > KEEP) kept.delete(kept.keys().next().value!);
  // A build that failed is not kept: the next request tries again.
  made.entries.catch(() => kept.get(c.id) === made && kept.delete(c.id));
  return { version, entries: await made.entries };
}
