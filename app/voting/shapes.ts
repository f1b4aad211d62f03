/** Voting shapes shared by the server modules, the results payload and the components. */
export type BallotMethod = "points" | "borda" | "schulze";
