import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { getInstanceByDom } from 'echarts/core';
import { provideEchartsCore } from 'ngx-echarts';
import { matchReportFixture } from './match-report-fixture';
import { MatchReportView } from './match-report-view';
import { memberStyle } from './member-styles';
import { reportChartOption, reportSeries } from './report-chart-option';
import type { MatchReportData } from './reports-api';

describe('reportSeries', () => {
  it('draws every curve of every member, named and styled by its member', () => {
    const { members } = matchReportFixture();
    const series = reportSeries(members);
    expect(series.map((s) => s.id)).toEqual([
      'valve-11-curve-0',
      'valve-11-curve-1',
      'valve-12-curve-0',
      'valve-12-curve-1',
    ]);
    expect(series.map((s) => s.name)).toEqual(['EL34-003', 'EL34-003', 'EL34-008', 'EL34-008']);
    expect(series[2].data).toEqual(members[1].curves[0].points);
    expect(series[0].lineStyle.color).toBe(memberStyle(0).colour);
    expect(series[2].lineStyle.color).toBe(memberStyle(1).colour);
    expect(series[0].lineStyle.color).not.toBe(series[2].lineStyle.color);
    // A black-and-white print still tells them apart: the second valve is dashed.
    expect(series[0].lineStyle.type).toBe('solid');
    expect(series[2].lineStyle.type).toEqual([...memberStyle(1).dash]);
  });

  it("labels the first member's curves with their grid voltage, and no other member's", () => {
    const series = reportSeries(matchReportFixture().members);
    expect(series[0].endLabel?.['formatter']).toBe('0 V');
    expect(series[1].endLabel?.['formatter']).toBe('-10 V');
    expect(series[2].endLabel).toBeUndefined();
  });

  it('labels only one of two curves that end in the same place, the more negative grid', () => {
    const [first, second] = matchReportFixture().members;
    const crowded = {
      ...first,
      curves: [
        {
          vg1Volts: 0,
          points: [
            [0, 0],
            [30, 160],
          ] as [number, number][],
        },
        {
          vg1Volts: -2.5,
          points: [
            [0, 0],
            [34, 158],
          ] as [number, number][],
        },
        {
          vg1Volts: -20,
          points: [
            [0, 0],
            [300, 20],
          ] as [number, number][],
        },
      ],
    };
    const labels = reportSeries([crowded, second])
      .filter((s) => s.endLabel)
      .map((s) => s.endLabel!['formatter']);
    expect(labels).toEqual(['-2.5 V', '-20 V']);
  });

  it('gives both axes their units and one legend entry per member, without animation', () => {
    const option = reportChartOption(matchReportFixture().members);
    expect((option['xAxis'] as { name: string }).name).toBe('Va (V)');
    expect((option['yAxis'] as { name: string }).name).toBe('Ia (mA)');
    expect((option['legend'] as { data: string[] }).data).toEqual(['EL34-003', 'EL34-008']);
    expect(option['animation']).toBe(false);
  });
});

describe('MatchReportView', () => {
  let fixture: ComponentFixture<MatchReportView>;

  async function render(report: MatchReportData): Promise<HTMLElement> {
    TestBed.configureTestingModule({
      imports: [MatchReportView],
      providers: [provideEchartsCore({ echarts: () => import('../echarts-setup') })],
    });
    fixture = TestBed.createComponent(MatchReportView);
    fixture.componentRef.setInput('report', report);
    await fixture.whenStable();
    return fixture.nativeElement as HTMLElement;
  }

  /** A definition list as "term value" lines. */
  const pairsOf = (dl: Element) =>
    [...dl.querySelectorAll('div')].map(
      (d) =>
        `${d.querySelector('dt')!.textContent!.trim()} ${d.querySelector('dd')!.textContent!.trim()}`,
    );

  const rowsOf = (el: HTMLElement, table: string) =>
    [...el.querySelectorAll(`table.${table} tbody tr`)].map((tr) =>
      [...tr.querySelectorAll('th, td')].map((c) => c.textContent!.trim()),
    );

  it('heads the report with the workshop, set code, type, date and status', async () => {
    const el = await render(matchReportFixture());
    expect(el.querySelector('h1')!.textContent!.trim()).toBe('Match report MS-0007');
    expect(el.querySelector('.workshop')!.textContent).toBe('Glowing Filament Workshop');
    expect(pairsOf(el.querySelector('.facts')!)).toEqual([
      'Type EL34',
      'Valves 2',
      'Matched 3 Nov 2026',
      'Status Reserved',
    ]);
    expect(el.querySelector('.verdict')!.textContent).toMatch(
      /Matched\s+within the tolerance of\s+5 %/,
    );
  });

  it('lists every member with its grade and its Ia and gm at the operating point', async () => {
    const el = await render(matchReportFixture());
    const heads = [...el.querySelectorAll('table.members thead th')].map((th) =>
      th.textContent!.trim(),
    );
    expect(heads).toEqual(['Line', 'Label', 'Type', 'Grade', 'At typical', 'Ia (mA)', 'gm (µS)']);
    expect(rowsOf(el, 'members')).toEqual([
      ['', 'EL34-003', 'EL34', 'good (98 %)', '100.2', '11040'],
      ['', 'EL34-008', 'EL34', 'good (98 %)', '102.2', '11261'],
    ]);
  });

  it('gives the conditions each member was measured under, with units', async () => {
    const el = await render(matchReportFixture());
    expect(rowsOf(el, 'conditions')[0]).toEqual([
      'EL34-003',
      'Bench B',
      '2 Nov 2026',
      '0 to 300, step 10',
      '0, -10',
      '250',
      '6.3',
    ]);
    const heads = el.querySelector('table.conditions thead')!.textContent!;
    for (const unit of ['Va (V)', 'Vg1 curves (V)', 'Vg2 (V)', 'Heater (V)']) {
      expect(heads).toContain(unit);
    }
  });

  it('shows the spreads against the tolerance and names where the tolerance comes from', async () => {
    const el = await render(matchReportFixture());
    expect(rowsOf(el, 'spreads')).toEqual([['typical', '101.2', '2.0', '11150', '2.1', '-13.5']]);
    expect(pairsOf(el.querySelector('.totals')!)).toEqual([
      'Curve spread 2.3 %',
      'Score 1.2 %',
      'Tolerance 5 %',
      'Acceptable Yes',
    ]);
    expect(el.textContent).toContain('the usual target in common practice');
  });

  it('says what is over the tolerance of a set that is not acceptable', async () => {
    const report = matchReportFixture();
    const el = await render({
      ...report,
      figures: {
        ...report.figures,
        acceptable: false,
        exceeds: ['gm at typical: 6.1 % (tolerance 5 %)'],
      },
    });
    expect(el.querySelector('.verdict')!.getAttribute('data-acceptable')).toBe('false');
    expect(el.querySelector('.exceeds')!.textContent).toContain('gm at typical: 6.1 %');
    expect(pairsOf(el.querySelector('.totals')!)).toContain('Acceptable No');
  });

  it('draws one chart with the curves of every member', async () => {
    const el = await render(matchReportFixture());
    const host = el.querySelector('app-match-report-chart .chart') as HTMLElement;
    await vi.waitFor(
      () => {
        const series = (getInstanceByDom(host)?.getOption()['series'] ?? []) as { name: string }[];
        expect(series.map((s) => s.name)).toEqual(['EL34-003', 'EL34-003', 'EL34-008', 'EL34-008']);
      },
      { timeout: 5000 },
    );
    // Scales with its box instead of being cropped by it.
    await vi.waitFor(() =>
      expect(host.querySelector('svg')?.getAttribute('viewBox')).toBe('0 0 680 380'),
    );
    expect(host.getAttribute('aria-label')).toContain('EL34-003, EL34-008');
    expect(el.textContent).toContain('Ia against Va at Vg1 = 0, -10 V');
  });

  it('ends with what was measured and the cautions, as the server words them', async () => {
    const el = await render(matchReportFixture());
    expect(el.textContent).toContain('What was measured: each valve was swept');
    const cautions = el.querySelector('.cautions')!;
    expect(cautions.querySelector('h3')!.textContent).toBe('Cautions');
    expect(cautions.textContent).toContain('high voltages that can kill');
  });
});
