/**
 * Least-squares fit of value ~ site + site:block + entry + entry:site for plots that may be
 * missing (any pattern, incomplete blocks included), giving R's sequential sums of squares in that
 * order. Blocks are absorbed within each site, so only entries x entries systems are solved:
 * the interaction model splits into one small fit per site, and the additive model sums the
 * per-site absorbed matrices. No dense QR of the whole design is formed.
 */
import { factorSymmetric, generalizedInverse, solveFactored, type SymmetricFactor } from "./linear-algebra";

/** Observed plots as dense indices; values are already shifted by a reference value. */
export interface PlotArrays {
  values: Float64Array;
  entry: Int32Array;
  block: Int32Array;
  /** site of each block */
  blockSite: Int32Array;
  entryCount: number;
  blockCount: number;
  siteCount: number;
}

export interface BlockModelFit {
  n: number;
  ssSite: number;
  ssBlock: number;
  ssEntry: number;
  ssEntrySite: number;
  ssResidual: number;
  dfSite: number;
  dfBlock: number;
  dfEntry: number;
  dfEntrySite: number;
  dfResidual: number;
  /** mean of observed values, on the shifted scale */
  grandMean: number;
  /** LS means on the shifted scale and their covariance divided by sigma^2, or null if not estimable */
  lsMeans: Float64Array | null;
  lsMeanCovariance: Float64Array | null;
  /** which model the LS means come from */
  lsMeanModel: "entry-by-site" | "additive" | null;
  /** per-site residual SS and df of value ~ block + entry (for Bartlett's test across sites) */
  siteResidualSs: Float64Array;
  siteResidualDf: Int32Array;
}

interface AbsorbedSystem {
  matrix: Float64Array;
  rhs: Float64Array;
  /** w = (1/B) sum over blocks of N_b / n_b: the entry weights of the average block */
  blockAverageWeights: Float64Array;
  /** (1/B^2) sum over blocks of 1/n_b: variance / sigma^2 of the average block mean */
  blockAverageVariance: number;
  /** average of the block means (shifted scale) */
  blockAverageMean: number;
}

/** Sum of squares with compensation (terms are non-negative). */
class SquareSum {
  sum = 0;
  compensation = 0;
  add(value: number): void {
    const square = value * value;
    const t = this.sum + square;
    if (this.sum >= square) this.compensation += this.sum - t + square;
    else this.compensation += square - t + this.sum;
    this.sum = t;
  }
  get value(): number {
    return this.sum + this.compensation;
  }
}

export function fitBlockModel(plots: PlotArrays): BlockModelFit {
  const { values, entry, block, blockSite, entryCount: E, blockCount: B, siteCount: S } = plots;
  const n = values.length;

  // plots grouped by block (CSR layout), block sums with compensation
  const blockStart = new Int32Array(B + 1);
  for (let i = 0; i < n; i++) blockStart[block[i] + 1]++;
  for (let b = 0; b < B; b++) blockStart[b + 1] += blockStart[b];
  const blockPlots = new Int32Array(n);
  const fill = blockStart.slice(0, B);
  for (let i = 0; i < n; i++) blockPlots[fill[block[i]]++] = i;

  const blockMean = new Float64Array(B);
  for (let b = 0; b < B; b++) {
    let sum = 0;
    let compensation = 0;
    for (let p = blockStart[b]; p < blockStart[b + 1]; p++) {
      const v = values[blockPlots[p]];
      const t = sum + v;
      if (Math.abs(sum) >= Math.abs(v)) compensation += sum - t + v;
      else compensation += v - t + sum;
      sum = t;
    }
    blockMean[b] = (sum + compensation) / (blockStart[b + 1] - blockStart[b]);
  }

  // site and grand means from block means weighted by block size (exact enough: few terms)
  const siteN = new Float64Array(S);
  const siteMean = new Float64Array(S);
  let grandSum = 0;
  for (let b = 0; b < B; b++) {
    const nb = blockStart[b + 1] - blockStart[b];
    siteN[blockSite[b]] += nb;
    siteMean[blockSite[b]] += nb * blockMean[b];
    grandSum += nb * blockMean[b];
  }
  for (let s = 0; s < S; s++) siteMean[s] /= siteN[s];
  const grandMean = grandSum / n;

  const siteSs = new SquareSum();
  for (let s = 0; s < S; s++) siteSs.add(Math.sqrt(siteN[s]) * (siteMean[s] - grandMean));
  const blockSs = new SquareSum();
  for (let b = 0; b < B; b++) {
    blockSs.add(Math.sqrt(blockStart[b + 1] - blockStart[b]) * (blockMean[b] - siteMean[blockSite[b]]));
  }

  // deviations from block means: the data after absorbing site and block
  const withinBlock = new Float64Array(n);
  for (let i = 0; i < n; i++) withinBlock[i] = values[i] - blockMean[block[i]];

  // blocks of each site
  const siteBlocks: number[][] = Array.from({ length: S }, () => []);
  for (let b = 0; b < B; b++) siteBlocks[blockSite[b]].push(b);

  const counts = new Float64Array(E);
  const present: number[] = [];
  const absorbSite = (blocks: number[], target: AbsorbedSystem): void => {
    const { matrix, rhs, blockAverageWeights } = target;
    for (const b of blocks) {
      const start = blockStart[b];
      const end = blockStart[b + 1];
      const nb = end - start;
      present.length = 0;
      for (let p = start; p < end; p++) {
        const i = blockPlots[p];
        const e = entry[i];
        if (counts[e] === 0) present.push(e);
        counts[e] += 1;
        rhs[e] += withinBlock[i];
      }
      for (const e of present) {
        const ce = counts[e];
        const row = e * E;
        matrix[row + e] += ce;
        for (const f of present) matrix[row + f] -= (ce * counts[f]) / nb;
        blockAverageWeights[e] += ce / nb;
      }
      target.blockAverageVariance += 1 / nb;
      target.blockAverageMean += blockMean[b];
      for (const e of present) counts[e] = 0;
    }
  };
  const newSystem = (): AbsorbedSystem => ({
    matrix: new Float64Array(E * E),
    rhs: new Float64Array(E),
    blockAverageWeights: new Float64Array(E),
    blockAverageVariance: 0,
    blockAverageMean: 0,
  });
  const finishAverages = (system: AbsorbedSystem, blockTotal: number): void => {
    for (let e = 0; e < E; e++) system.blockAverageWeights[e] /= blockTotal;
    system.blockAverageVariance /= blockTotal * blockTotal;
    system.blockAverageMean /= blockTotal;
  };

  // interaction model: one absorbed system per site; additive model: their sum
  const additive = newSystem();
  const siteSystems: AbsorbedSystem[] = [];
  const siteFactors: SymmetricFactor[] = [];
  const siteEffects: Float64Array[] = [];
  let interactionRank = 0;
  for (let s = 0; s < S; s++) {
    const system = newSystem();
    absorbSite(siteBlocks[s], system);
    for (let x = 0; x < E * E; x++) additive.matrix[x] += system.matrix[x];
    for (let e = 0; e < E; e++) {
      additive.rhs[e] += system.rhs[e];
      additive.blockAverageWeights[e] += system.blockAverageWeights[e];
    }
    additive.blockAverageVariance += system.blockAverageVariance;
    additive.blockAverageMean += system.blockAverageMean;
    finishAverages(system, siteBlocks[s].length);
    const factor = factorSymmetric(system.matrix, E);
    siteSystems.push(system);
    siteFactors.push(factor);
    siteEffects.push(solveFactored(factor, system.rhs));
    interactionRank += factor.rank;
  }
  finishAverages(additive, B);
  const additiveFactor = factorSymmetric(additive.matrix, E);
  const additiveEffects = solveFactored(additiveFactor, additive.rhs);

  // fitted entry parts and residuals of both models, plot by plot (no SS by subtraction)
  const entrySs = new SquareSum();
  const interactionSs = new SquareSum();
  const residualSs = new SquareSum();
  const siteResidualSs = new Float64Array(S);
  const siteResidualDf = new Int32Array(S);
  for (let s = 0; s < S; s++) {
    const tauSite = siteEffects[s];
    const siteResidual = new SquareSum();
    let siteN = 0;
    for (const b of siteBlocks[s]) {
      const start = blockStart[b];
      const end = blockStart[b + 1];
      const nb = end - start;
      let averageAdditive = 0;
      let averageSite = 0;
      for (let p = start; p < end; p++) {
        const e = entry[blockPlots[p]];
        averageAdditive += additiveEffects[e];
        averageSite += tauSite[e];
      }
      averageAdditive /= nb;
      averageSite /= nb;
      for (let p = start; p < end; p++) {
        const i = blockPlots[p];
        const fittedAdditive = additiveEffects[entry[i]] - averageAdditive;
        const fittedSite = tauSite[entry[i]] - averageSite;
        entrySs.add(fittedAdditive);
        interactionSs.add(fittedSite - fittedAdditive);
        const residual = withinBlock[i] - fittedSite;
        residualSs.add(residual);
        siteResidual.add(residual);
      }
      siteN += nb;
    }
    siteResidualSs[s] = siteResidual.value;
    siteResidualDf[s] = siteN - siteBlocks[s].length - siteFactors[s].rank;
  }

  const ls = leastSquaresMeans(siteSystems, siteFactors, siteEffects, additive, additiveFactor, additiveEffects, E);

  return {
    n,
    ssSite: siteSs.value,
    ssBlock: blockSs.value,
    ssEntry: entrySs.value,
    ssEntrySite: interactionSs.value,
    ssResidual: residualSs.value,
    dfSite: S - 1,
    dfBlock: B - S,
    dfEntry: additiveFactor.rank,
    dfEntrySite: interactionRank - additiveFactor.rank,
    dfResidual: n - B - interactionRank,
    grandMean,
    lsMeans: ls?.means ?? null,
    lsMeanCovariance: ls?.covariance ?? null,
    lsMeanModel: ls?.model ?? null,
    siteResidualSs,
    siteResidualDf,
  };
}

/**
 * LS mean of an entry = its fitted value averaged over the blocks. From the entry x site model
 * when every entry is estimable at every site (each site weighs the same, and each block within
 * its site), else from the additive model (each block weighs the same), else null (not estimable).
 * Covariances are per unit error variance: (e_i - w)' G (e_j - w) + var(average block mean).
 */
function leastSquaresMeans(
  siteSystems: AbsorbedSystem[],
  siteFactors: SymmetricFactor[],
  siteEffects: Float64Array[],
  additive: AbsorbedSystem,
  additiveFactor: SymmetricFactor,
  additiveEffects: Float64Array,
  E: number,
): { means: Float64Array; covariance: Float64Array; model: "entry-by-site" | "additive" } | null {
  const estimable = (factor: SymmetricFactor, system: AbsorbedSystem): boolean => {
    if (factor.rank !== E - 1) return false;
    for (let e = 0; e < E; e++) if (!(system.matrix[e * E + e] > 0)) return false;
    return true;
  };
  const contribution = (system: AbsorbedSystem, factor: SymmetricFactor, effects: Float64Array, weight: number) => {
    const w = system.blockAverageWeights;
    const inverse = generalizedInverse(factor);
    let weightedEffect = 0;
    for (let e = 0; e < E; e++) weightedEffect += w[e] * effects[e];
    // G w, and w' G w
    const gw = new Float64Array(E);
    let wgw = 0;
    for (let i = 0; i < E; i++) {
      let value = 0;
      for (let j = 0; j < E; j++) value += inverse[i * E + j] * w[j];
      gw[i] = value;
      wgw += w[i] * value;
    }
    const means = new Float64Array(E);
    const covariance = new Float64Array(E * E);
    for (let i = 0; i < E; i++) {
      means[i] = weight * (effects[i] - weightedEffect + system.blockAverageMean);
      for (let j = 0; j < E; j++) {
        covariance[i * E + j] =
          weight * weight * (inverse[i * E + j] - gw[i] - gw[j] + wgw + system.blockAverageVariance);
      }
    }
    return { means, covariance };
  };

  if (siteSystems.length > 1 && siteSystems.every((system, s) => estimable(siteFactors[s], system))) {
    const means = new Float64Array(E);
    const covariance = new Float64Array(E * E);
    const weight = 1 / siteSystems.length;
    siteSystems.forEach((system, s) => {
      const part = contribution(system, siteFactors[s], siteEffects[s], weight);
      for (let i = 0; i < E; i++) means[i] += part.means[i];
      for (let x = 0; x < E * E; x++) covariance[x] += part.covariance[x];
    });
    return { means, covariance, model: "entry-by-site" };
  }
  if (estimable(additiveFactor, additive)) {
    return { ...contribution(additive, additiveFactor, additiveEffects, 1), model: "additive" };
  }
  return null;
}
