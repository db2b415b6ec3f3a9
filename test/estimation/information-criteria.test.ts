import { describe, expect, it } from 'vitest';
import { aic, aicc, akaikeWeights, bic, gaussianLogLikelihood, likelihoodRatioTest } from '../../src/estimation/information-criteria.js';

describe('information criteria', () => {
  it('Gaussian log-likelihood: the normal density formula', () => {
    // ln of the standard normal density at 0 is -ln(2 pi)/2 = -0.9189385332046727 (any statistics handbook)
    expect(gaussianLogLikelihood([{ samples: 1, sigma: 1, weightedSSE: 0 }])).toBeCloseTo(-0.9189385332046727, 14);
    // n samples with ML sigma (weighted SSE = n): -n/2 (ln(2 pi sigma^2) + 1)
    const n = 50;
    const s = 0.3;
    expect(gaussianLogLikelihood([{ samples: n, sigma: s, weightedSSE: n }])).toBeCloseTo((-n / 2) * (Math.log(2 * Math.PI * s * s) + 1), 10);
  });

  it('AIC, AICc and BIC follow their published definitions', () => {
    // Akaike 1974: AIC = 2k - 2 lnL
    expect(aic(-10, 3)).toBe(26);
    // Hurvich & Tsai 1989: AICc = AIC + 2k(k+1)/(n-k-1); k = 3, n = 20: 26 + 24/16 = 27.5
    expect(aicc(-10, 3, 20)).toBeCloseTo(27.5, 12);
    expect(aicc(-10, 3, 4)).toBe(Infinity);
    // Schwarz 1978: BIC = k ln n - 2 lnL
    expect(bic(-10, 3, 20)).toBeCloseTo(3 * Math.log(20) + 20, 12);
  });

  it('Akaike weights: exp(-delta/2) normalised (Burnham & Anderson 2002, sec. 2.9)', () => {
    const w = akaikeWeights([100, 102, 110]);
    const raw = [1, Math.exp(-1), Math.exp(-5)];
    const sum = raw[0] + raw[1] + raw[2];
    w.forEach((x, i) => expect(x).toBeCloseTo(raw[i] / sum, 14));
    expect(akaikeWeights([1, Infinity])).toEqual([1, 0]);
  });

  it('likelihood-ratio test p-values match chi-square tables', () => {
    // chi-square upper 5 % point with 1 dof is 3.841459 (NIST/SEMATECH e-Handbook, table 1.3.6.7.4)
    const t1 = likelihoodRatioTest({ logLikelihood: -100, k: 2 }, { logLikelihood: -100 + 3.841459 / 2, k: 3 });
    expect(t1.dof).toBe(1);
    expect(t1.pValue).toBeCloseTo(0.05, 6);
    // with 2 dof the survival function is exp(-x/2) (closed form of the chi-square with 2 dof)
    const t2 = likelihoodRatioTest({ logLikelihood: -50, k: 1 }, { logLikelihood: -47, k: 3 });
    expect(t2.statistic).toBeCloseTo(6, 12);
    expect(t2.pValue).toBeCloseTo(Math.exp(-3), 10);
    expect(() => likelihoodRatioTest({ logLikelihood: 0, k: 3 }, { logLikelihood: 0, k: 3 })).toThrow();
  });
});
