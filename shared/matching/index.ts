export { CostMatrix } from './cost-matrix';
export {
  compareReadings,
  comparedSections,
  NO_OVERLAP_PERCENT,
  relativeDifferencePercent,
  type PointDifference,
  type ReadingComparison,
} from './compare-readings';
export { findPartners, type PartnerMatch } from './find-partners';
export { canonical, formGroups } from './form-groups';
export { groupSpread, type GroupSpread, type PointSpread } from './group-spread';
export {
  compareIds,
  groupValves,
  type LeftOverReason,
  type LeftOverValve,
  type MatchGroup,
  type MatchMember,
  type MatchResult,
} from './group-valves';
export { improvePartition, isBetter, type Partition } from './improve-partition';
export type { MatchSurface, SurfaceReading } from './match-surface';
export { DEFAULT_TOLERANCE_PERCENT, MATCH_TOLERANCES } from './match-tolerances';
export { matchValves, prepareValves, type MatchCandidate } from './match-valves';
export {
  resolveCriteria,
  screenVoltsAgree,
  type EqualCurrentPoint,
  type FixedBiasPoint,
  type MatchingCriteria,
  type MatchPoint,
  type MatchWindow,
  type ResolvedCriteria,
  type ResolvedPoint,
  type ResolvedWindow,
} from './matching-criteria';
export { METRIC_DESCRIPTION } from './metric-description';
export {
  EXACT_MATCHING_LIMIT,
  minCostMatching,
  SPARSE_NEIGHBOURS,
  type MatchingOptions,
} from './min-cost-matching';
export { sectionBalance, type SectionBalance, type SectionPointBalance } from './section-balance';
export { anodeFamilySurface, surfaceFromSweep } from './sweep-surface';
export {
  extractFeatures,
  type FeatureRefusal,
  type PointReading,
  type SectionReadings,
  type SurfaceValve,
  type ValveFeatures,
} from './valve-features';
export { distanceMatrix, valveDistance, type ValveDistance } from './valve-distance';
