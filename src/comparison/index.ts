/** Model ranking: candidate models of one rig fitted to the same data, compared by AICc (the verb: src/verbs/rank.ts). */
export { rankFits } from './rank-fits.js';
export type { CandidateFit, NestedTest, RankResult, RankedModel, ValidationScore, WhitenessScore } from './rank-fits.js';
export type { LikelihoodSummary, OutputNoise } from './likelihood.js';
