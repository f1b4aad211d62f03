/** Audience ballots: validation before storing, and the three ways of counting them. */
export { validateBallot, sortBallots, MAX_POINTS } from "./validate-ballot";
export type { BallotCheck, BallotKind, BallotProblem, BallotProblemCode, PointsBallot, RankedBallot, RejectedBallot } from "./validate-ballot";
export { tallyPoints, type PointsEntry, type PointsTally } from "./points";
export { tallyBorda, bordaPoints, type BordaEntry, type BordaTally } from "./borda";
export { tallySchulze, pairwisePreferences, strongestPaths, type CandidateMatrix, type SchulzeTally } from "./schulze";
