import { DestroyRef, effect, inject, signal, untracked, type Signal } from '@angular/core';
import { buildAnodeFamily, type AnodeFamily } from '../../../shared/analysis/anode-family';
import type { SweepPoint } from '../../../shared/domain/sweep';

/** Longest wait between rebuilds of a family while points arrive, ms. */
export const FAMILY_REBUILD_MS = 500;

/** What the analysis can work with so far. */
export type FamilyState =
  | { status: 'empty' }
  | { status: 'refused'; reason: string; pointCount: number }
  | { status: 'ready'; family: AnodeFamily; pointCount: number };

/**
 * The anode family of a growing set of points, rebuilt at most every `intervalMs` and only from
 * the points already there: the first points build at once, later ones at the end of the window.
 * Call in an injection context.
 */
export function throttledFamily(
  points: Signal<readonly SweepPoint[]>,
  intervalMs = FAMILY_REBUILD_MS,
): Signal<FamilyState> {
  const state = signal<FamilyState>({ status: 'empty' });
  let timer: ReturnType<typeof setTimeout> | null = null;
  let lastBuildAt = Number.NEGATIVE_INFINITY;
  let builtFrom: readonly SweepPoint[] | null = null;

  const build = () => {
    timer = null;
    const current = untracked(points);
    // Waiting for the first points is not a build: they must show at once.
    if (current.length > 0) lastBuildAt = performance.now();
    if (current === builtFrom) return;
    builtFrom = current;
    state.set(familyState(current));
  };

  effect(() => {
    points();
    if (timer) return;
    const wait = lastBuildAt + intervalMs - performance.now();
    if (wait <= 0) build();
    else timer = setTimeout(build, wait);
  });
  inject(DestroyRef).onDestroy(() => {
    if (timer) clearTimeout(timer);
  });
  return state.asReadonly();
}

/** Builds the family of `points` at once. */
export function familyState(points: readonly SweepPoint[]): FamilyState {
  if (points.length === 0) return { status: 'empty' };
  const built = buildAnodeFamily(points);
  return built.ok
    ? { status: 'ready', family: built.family, pointCount: points.length }
    : { status: 'refused', reason: built.reason, pointCount: points.length };
}
