/** One phrase per verdict, whatever the page (common practice, no source: our own wording). */
import { describe, expect, it } from 'vitest';
import { likelihoodRatioVerdict, RESIDUAL_VERDICTS, whitenessLabel, whitenessTally } from '../../src/presentation/verdicts.js';

describe('verdicts', () => {
  it('labels one output white, not white or not judged', () => {
    expect(whitenessLabel({ white: true })).toBe('white');
    expect(whitenessLabel({ white: false })).toBe('not white');
    expect(whitenessLabel(undefined)).toBe('not judged');
  });

  it('tallies several outputs, leaving out those not judged', () => {
    expect(whitenessTally([true, true, null])).toBe('white');
    expect(whitenessTally([false, true, false, null])).toBe('2/3 not white');
    expect(whitenessTally([null])).toBe('not judged');
  });

  it('words the Ljung-Box p-value with the policy of every p-value', () => {
    expect(RESIDUAL_VERDICTS.weaklyCorrelated(0.0172, '0.02 s')).toContain('(Ljung-Box p = 0.017), most at lag 0.02 s');
    expect(RESIDUAL_VERDICTS.weaklyCorrelated(1e-20, '6 s')).toContain('(Ljung-Box p < 1e-15)');
  });

  it('says which nested model the likelihood-ratio test supports', () => {
    expect(likelihoodRatioVerdict('big', 'small', true, 0.05)).toBe('big fits significantly better than small at the 5 % level: its extra parameters are supported');
    expect(likelihoodRatioVerdict('big', 'small', false, 0.05)).toMatch(/does not fit significantly better .*keep the simpler model$/);
  });
});
