/** Model ranking: candidate models of one rig fitted to the same data, compared by AICc (the verb: src/verbs/rank.ts). */
export { rankFits, OBJECTIVE_TEXT, SUBSTANTIAL_SUPPORT_DELTA, LRT_ALPHA } from './rank-fits.js';
export type { CandidateFit, NestedTest, RankResult, RankedModel, ValidationScore, WhitenessScore } from './rank-fits.js';
export { fitLikelihood } from './likelihood.js';
export type { LikelihoodSummary, OutputNoise } from './likelihood.js';
export { checkSameData } from './same-data.js';
export { rankJson, rankText } from './rank-report.js';
