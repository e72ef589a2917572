import type { Refusal } from '../analysis/refusal';
import type { SweepPoint } from '../domain/sweep';
import { groupValves, type LeftOverValve, type MatchResult } from './group-valves';
import { resolveCriteria, type MatchingCriteria, type ResolvedCriteria } from './matching-criteria';
import type { MatchingOptions } from './min-cost-matching';
import { surfaceFromSweep } from './sweep-surface';
import { extractFeatures, type ValveFeatures } from './valve-features';

/** A valve to match, as measured: its anode family (and section 2's for double triodes). */
export interface MatchCandidate {
  /** Unique id; ties are broken by it. */
  id: string;
  /** Label shown to the user. */
  label: string;
  /** Designation the valve is catalogued under, if known: checked against the criteria. */
  valveType?: string;
  /** Anode family of section 1 (the only section of single valves). */
  family: readonly SweepPoint[];
  /** Anode family of section 2 of a double triode. */
  section2Family?: readonly SweepPoint[];
}

/**
 * Features of every candidate under the criteria, and the candidates that cannot take part
 * (family not analysable, no answer at a point, another type) as left-over entries. This is the
 * costly step (the family analysis); its output can be kept and grouped again and again.
 */
export function prepareValves(
  candidates: readonly MatchCandidate[],
  criteria: ResolvedCriteria,
): { features: ValveFeatures[]; excluded: LeftOverValve[] } {
  const features: ValveFeatures[] = [];
  const excluded: LeftOverValve[] = [];
  for (const c of candidates) {
    const s1 = surfaceFromSweep(c.family);
    if (!s1.ok) {
      excluded.push({ id: c.id, label: c.label, reason: 'no-data', detail: s1.reason });
      continue;
    }
    const s2 = c.section2Family ? surfaceFromSweep(c.section2Family) : null;
    const f = extractFeatures(
      {
        id: c.id,
        label: c.label,
        valveType: c.valveType,
        section1: s1.surface,
        section2: s2?.ok ? s2.surface : null,
      },
      criteria,
    );
    if (!f.ok) {
      excluded.push({ id: c.id, label: c.label, reason: f.kind, detail: f.reason });
      continue;
    }
    if (s2 && !s2.ok) f.features.section2Problem = `section 2: ${s2.reason}`;
    features.push(f.features);
  }
  return { features, excluded };
}

/** Checks the criteria, analyses every candidate's family and groups the pool. */
export function matchValves(
  candidates: readonly MatchCandidate[],
  criteria: MatchingCriteria,
  options: MatchingOptions = {},
): MatchResult | Refusal {
  const resolved = resolveCriteria(criteria);
  if (!resolved.ok) return resolved;
  const { features, excluded } = prepareValves(candidates, resolved.criteria);
  return groupValves(features, resolved.criteria, excluded, options);
}
