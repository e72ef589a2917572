import { TestBed } from '@angular/core/testing';
import { getInstanceByDom } from 'echarts/core';
import { provideEchartsCore } from 'ngx-echarts';
import type { SweepPlan } from '../../../shared/domain/sweep';
import { pointsOf, SMALL_PLAN } from '../../testing/fixtures';
import { SweepChart } from './sweep-chart';
import { sweepSeries } from './sweep-series';

describe('sweepSeries', () => {
  it('builds one Ia series per curve, named by its grid voltage', () => {
    const series = sweepSeries(SMALL_PLAN, pointsOf(SMALL_PLAN, 5), true);
    expect(series.map((s) => s.id)).toEqual(['ia-0', 'ia-1', 'ia-2']);
    expect(series.map((s) => s.name)).toEqual(['Vg1 = 0 V', 'Vg1 = -1 V', 'Vg1 = -2 V']);
    expect(series[1].data).toEqual(
      pointsOf(SMALL_PLAN, 5)
        .filter((p) => p.curve === 1)
        .map((p) => [p.vaVolts, p.iaMilliamps]),
    );
  });

  it('only draws curves that have points so far', () => {
    const points = pointsOf(SMALL_PLAN, 5)
      .filter((p) => p.curve < 2)
      .slice(0, 7);
    expect(sweepSeries(SMALL_PLAN, points, false).map((s) => s.id)).toEqual(['ia-0', 'ia-1']);
  });

  it('adds a dashed Ig2 series sharing the legend name where screen current was measured', () => {
    const pentode: SweepPlan = { ...SMALL_PLAN, vg2Volts: 250 };
    const series = sweepSeries(pentode, pointsOf(pentode, 4, true), true);
    expect(series.map((s) => s.id)).toEqual(['ia-0', 'ig2-0', 'ia-1', 'ig2-1', 'ia-2', 'ig2-2']);
    const ig2 = series.find((s) => s.id === 'ig2-1')!;
    expect(ig2.lineStyle.type).toBe('dashed');
    expect(ig2.name).toBe('Vg1 = -1 V');
  });

  it('orders points by sequence within a curve', () => {
    const points = pointsOf(SMALL_PLAN, 4)
      .filter((p) => p.curve === 0)
      .reverse();
    const [only] = sweepSeries(SMALL_PLAN, points, true);
    expect(only.data.map(([va]) => va)).toEqual([0, 50, 100, 150]);
  });

  it('draws a transfer curve as one series against Vg1', () => {
    const transfer: SweepPlan = { ...SMALL_PLAN, kind: 'transfer', vaStartVolts: 250 };
    const points = [0, -1, -2].map((vg1, seq) => ({
      seq,
      curve: 0,
      vaVolts: 250,
      vg1Volts: vg1,
      vg2Volts: 0,
      iaMilliamps: 2 + vg1,
      ig2Milliamps: 0,
    }));
    const series = sweepSeries(transfer, points, true);
    expect(series).toHaveLength(1);
    expect(series[0].name).toBe('Va = 250 V');
    expect(series[0].data).toEqual([
      [0, 2],
      [-1, 1],
      [-2, 0],
    ]);
  });
});

describe('SweepChart', () => {
  it('puts one series per curve on the chart and follows new curves as they arrive', async () => {
    TestBed.configureTestingModule({
      imports: [SweepChart],
      providers: [provideEchartsCore({ echarts: () => import('../echarts-setup') })],
    });
    const fixture = TestBed.createComponent(SweepChart);
    fixture.componentRef.setInput('plan', SMALL_PLAN);
    const all = pointsOf(SMALL_PLAN, 5);
    fixture.componentRef.setInput(
      'points',
      all.filter((p) => p.curve === 0),
    );
    await fixture.whenStable();
    const host = (fixture.nativeElement as HTMLElement).querySelector('.chart') as HTMLElement;

    const seriesIds = () =>
      ((getInstanceByDom(host)?.getOption()['series'] ?? []) as { id: string }[]).map((s) => s.id);
    await vi.waitFor(() => expect(seriesIds()).toEqual(['ia-0']), { timeout: 5000 });

    fixture.componentRef.setInput('points', all);
    await vi.waitFor(() => expect(seriesIds()).toEqual(['ia-0', 'ia-1', 'ia-2']), {
      timeout: 5000,
    });
    const option = getInstanceByDom(host)!.getOption();
    expect((option['legend'] as { data: string[] }[])[0].data).toEqual([
      'Vg1 = 0 V',
      'Vg1 = -1 V',
      'Vg1 = -2 V',
    ]);
  });
});
