import postgres from "postgres";
import { env } from "~/env.server";

/**
 * Does PostgreSQL answer right now? A probe on its own one-connection client (never queued behind a busy pool),
 * bounded in time. Used after a request failed, to tell "the database is away" (503, try again shortly) from a
 * bug (500).
 */
let probe: ReturnType<typeof postgres> | undefined;

export async function databaseAnswers(timeoutMs = 2000): Promise<boolean> {
  probe ??= postgres(env().DATABASE_URL, { max: 1, idle_timeout: 5, connect_timeout: Math.ceil(timeoutMs / 1000), onnotice: () => {} });
  let timer: ReturnType<typeof setTimeout> | undefined;
  const timeout = new Promise<false>((resolve) => {
    timer = setTimeout(() => resolve(false), timeoutMs);
  });
  const query = probe`select 1 as ok`.then(
    () => true,
    () => false,
  );
  const answer = await Promise.race([query, timeout]);
  clearTimeout(timer);
  return answer;
}

export const DATABASE_AWAY_MESSAGE = "The database is not answering right now. Your work is safe; try again in a moment.";
