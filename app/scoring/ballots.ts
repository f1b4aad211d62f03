/** Audience ballots: validation before storing, and the three ways of counting them. */
export { validateBallot } from "./validate-ballot";
export type { BallotProblem, PointsBallot, RankedBallot } from "./validate-ballot";
export { tallyPoints } from "./points";
export { tallyBorda } from "./borda";
export { tallySchulze } from "./schulze";
