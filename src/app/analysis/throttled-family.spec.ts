import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { SweepPoint } from '../../../shared/domain/sweep';
import {
  childLangmuirPoints,
  CHILD_LANGMUIR_PLAN,
  WORKED_K,
} from '../../testing/child-langmuir-points';
import { FAMILY_REBUILD_MS, throttledFamily, type FamilyState } from './throttled-family';

const ALL = childLangmuirPoints(WORKED_K, 100, CHILD_LANGMUIR_PLAN);
const perCurve = ALL.filter((p) => p.curve === 0).length;
/** The first `curves` curves of the ideal-triode family. */
const curves = (n: number) => ALL.slice(0, n * perCurve);
const curveCount = (s: FamilyState) => (s.status === 'ready' ? s.family.curves.length : 0);

describe('throttledFamily', () => {
  afterEach(() => vi.useRealTimers());

  it('builds at once, then at most once a window, from the points there at its end', () => {
    vi.useFakeTimers({ toFake: ['setTimeout', 'clearTimeout', 'performance'] });
    const points = signal<readonly SweepPoint[]>([]);
    const state = TestBed.runInInjectionContext(() => throttledFamily(points));
    TestBed.tick();
    expect(state().status).toBe('empty');

    points.set(curves(2));
    TestBed.tick();
    // Two curves are not a family yet: refused, with the reason.
    const refused = state();
    expect(refused.status).toBe('refused');
    if (refused.status === 'refused') expect(refused.reason).toMatch(/at least three curves/);

    points.set(curves(3));
    TestBed.tick();
    points.set(curves(4));
    TestBed.tick();
    expect(state().status).toBe('refused');

    vi.advanceTimersByTime(FAMILY_REBUILD_MS - 1);
    expect(state().status).toBe('refused');
    vi.advanceTimersByTime(1);
    expect(curveCount(state())).toBe(4);
  });

  it('rebuilds at once when the window has passed since the last build', () => {
    vi.useFakeTimers({ toFake: ['setTimeout', 'clearTimeout', 'performance'] });
    const points = signal<readonly SweepPoint[]>(curves(3));
    const state = TestBed.runInInjectionContext(() => throttledFamily(points));
    TestBed.tick();
    expect(curveCount(state())).toBe(3);

    vi.advanceTimersByTime(FAMILY_REBUILD_MS);
    points.set(curves(5));
    TestBed.tick();
    expect(curveCount(state())).toBe(5);
  });
});
