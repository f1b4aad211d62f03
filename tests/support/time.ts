import { zonedWallTimeToUtc } from "~/competitions/timezone";

/** A wall-clock time in a zone as an instant, through the product's one converter; throws where it refuses. */
export function wallTimeInstant(wall: string, tz: string): Date {
  const r = zonedWallTimeToUtc(wall, tz);
  if (!r.ok) throw new Error(`${wall} ${r.reason === "nonexistent" ? "does not exist" : "is not a wall time"} in ${tz}`);
  return r.utc;
}
