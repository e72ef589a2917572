import { importProvidersFrom } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { provideRouter } from '@angular/router';
import { MatchGroupList } from './match-group-list';
import { matchRun } from './matching-fixtures';
import type { MatchRun } from './matching-api';

describe('MatchGroupList', () => {
  let fixture: ComponentFixture<MatchGroupList>;
  const element = () => fixture.nativeElement as HTMLElement;
  const text = (el: Element | null) => (el?.textContent ?? '').replace(/\s+/g, ' ').trim();

  async function render(run: MatchRun, selected: number | null = 0) {
    TestBed.configureTestingModule({
      imports: [MatchGroupList],
      providers: [provideRouter([]), importProvidersFrom(MatIconTestingModule)],
    });
    fixture = TestBed.createComponent(MatchGroupList);
    fixture.componentRef.setInput('run', run);
    fixture.componentRef.setInput('selected', selected);
    await fixture.whenStable();
  }

  it('lists each group with its label, verdict against the tolerance and score', async () => {
    await render(matchRun());
    const groups = [...element().querySelectorAll('li.group')];
    expect(groups).toHaveLength(2);
    expect(text(groups[0].querySelector('.group-head'))).toContain('Quad 1');
    expect(text(groups[0].querySelector('.verdict'))).toBe('Within 5 %');
    expect(text(groups[0].querySelector('.score'))).toBe('score 2.2 %');
    expect(text(groups[1].querySelector('.verdict'))).toBe('Over 5 %');
    expect(text(groups[1].querySelector('.exceeds'))).toBe('Ia at idle: 6.1 % (tolerance 5 %)');
    expect(text(element().querySelector('.summary'))).toContain(
      '9 valves with a usable sweep considered · 2 groups, 1 within the 5 % tolerance',
    );
  });

  it('links every member to its valve record', async () => {
    await render(matchRun());
    const links = [...element().querySelectorAll('li.group')[0].querySelectorAll('.members a')];
    expect(links.map((a) => text(a))).toEqual(['KL-0010', 'KL-0011', 'KL-0013', 'KL-0014']);
    expect(links[0].getAttribute('href')).toBe('/valves/10');
  });

  it('gives the spreads of Ia and gm with their units, and the curve spread', async () => {
    await render(matchRun());
    const rows = (group: number) =>
      [...element().querySelectorAll('li.group')[group].querySelectorAll('tbody tr')].map((r) =>
        [...r.querySelectorAll('td')].map((c) => text(c)),
      );
    expect(rows(0)).toEqual([
      ['idle Va 250 V, Vg1 -13.5 V, Vg2 250 V', '88.9 mA', '2.7 %', '11145 µS', '2.1 %'],
    ]);
    expect(rows(1)[1]).toEqual([
      'whole curves in the window',
      'largest difference between two members',
      '6.2 %',
    ]);
  });

  it('shows the grid voltages of an equal-current point, where Ia agrees by choice', async () => {
    const run = matchRun();
    run.groups[0].points = [
      {
        label: 'at 50 mA',
        section: 1,
        kind: 'equal-current',
        iaMeanMilliamps: 50,
        iaSpreadPercent: null,
        gmMeanMicrosiemens: 9000,
        gmSpreadPercent: 1.5,
        vg1MeanVolts: -16.2,
        vg1SpreadVolts: 0.8,
      },
    ];
    await render(run);
    const cells = [
      ...element().querySelectorAll('li.group')[0].querySelectorAll('tbody tr td'),
    ].map((c) => text(c));
    expect(cells).toEqual([
      'at 50 mA',
      '50 mA',
      'equal by choice',
      '9000 µS',
      '1.5 %',
      '-16.2 V (spread 0.8 V)',
    ]);
  });

  it("places a point by the hub's own Va and Vg2 where the criteria give none", async () => {
    const run = matchRun({ criteria: { valveType: 'EL34', groupSize: 4 } });
    run.groups[0].points = [
      { ...run.groups[0].points[0], label: 'typical', vaVolts: 250, vg2Volts: 250 },
    ];
    await render(run);
    const first = element().querySelector('li.group tbody tr td')!;
    expect(text(first)).toBe('typical Va 250 V, Vg1 -13.5 V, Vg2 250 V');
  });

  it('names the valves left over with the reason', async () => {
    await render(matchRun());
    const item = element().querySelector('.left-over li')!;
    expect(text(item.querySelector('a'))).toBe('KL-0019');
    expect(item.querySelector('a')!.getAttribute('href')).toBe('/valves/19');
    expect(text(item.querySelector('.reason'))).toBe('Fills no further group');
    expect(text(item.querySelector('.detail'))).toBe(
      '1 of 9 matchable valves do not fill another group of 4',
    );
  });

  it('marks the chosen group and reports a click on another', async () => {
    await render(matchRun(), 0);
    const heads = [...element().querySelectorAll<HTMLButtonElement>('.group-head')];
    expect(heads.map((h) => h.getAttribute('aria-pressed'))).toEqual(['true', 'false']);
    const chosen: number[] = [];
    fixture.componentInstance.selectGroup.subscribe((i) => chosen.push(i));
    heads[1].click();
    expect(chosen).toEqual([1]);
  });

  it('says what to change when no group could be formed', async () => {
    await render(matchRun({ groups: [], leftOver: [], poolSize: 3 }), null);
    expect(text(element().querySelector('.empty'))).toContain('No group could be formed');
    expect(element().querySelectorAll('li.group')).toHaveLength(0);
  });
});
