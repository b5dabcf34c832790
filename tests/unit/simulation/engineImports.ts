// Internal modules some tests need beyond the public index.
export * from '@/simulation';
export { correlation as correlationOf, percentileOfSorted, lowerTailMean, sampleVariance, standardErrorOfMean } from '@/simulation/statistics';
