import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';
import type { PartnerList } from './matching-api';
import { PartnerPanel } from './partner-panel';

const LIST: PartnerList = {
  valveId: 10,
  criteria: { valveType: 'EL34', tolerancePercent: 5 },
  partners: [
    {
      valveId: 11,
      label: 'KL-0011',
      status: 'in-stock',
      sweepId: 11,
      distancePercent: 0.41,
      withinTolerance: true,
      exceeds: [],
    },
    {
      valveId: 15,
      label: 'KL-0015',
      status: 'in-stock',
      sweepId: 15,
      distancePercent: 12.3,
      withinTolerance: false,
      exceeds: ['gm at typical: 13.0 % (tolerance 5 %)'],
    },
  ],
  metricDescription: '',
};

describe('PartnerPanel', () => {
  let fixture: ComponentFixture<PartnerPanel>;
  let http: HttpTestingController;
  const element = () => fixture.nativeElement as HTMLElement;
  const text = (el: Element | null) => (el?.textContent ?? '').replace(/\s+/g, ' ').trim();

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [PartnerPanel],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(PartnerPanel);
    fixture.componentRef.setInput('valveId', 10);
    await fixture.whenStable();
  });

  afterEach(() => http.verify());

  it('ranks the partners nearest first with their distance, verdict and links', async () => {
    http.expectOne('/api/valves/10/partners?limit=10&tolerancePercent=5').flush(LIST);
    await fixture.whenStable();
    const items = [...element().querySelectorAll('.partners li')];
    expect(items.map((li) => text(li.querySelector('a')))).toEqual(['KL-0011', 'KL-0015']);
    expect(items[0].querySelector('a')!.getAttribute('href')).toBe('/valves/11');
    expect(text(items[0].querySelector('.distance'))).toBe('0.4 % apart');
    expect(text(items[0].querySelector('.ok'))).toBe('within 5 %');
    expect(text(items[1].querySelector('.over'))).toBe(
      'over: gm at typical: 13.0 % (tolerance 5 %)',
    );
    expect(items[1].querySelector('.sweep')!.getAttribute('href')).toBe('/sweeps/15');
  });

  it('asks again at another tolerance preset', async () => {
    http.expectOne((r) => r.url === '/api/valves/10/partners').flush(LIST);
    await fixture.whenStable();
    const tight = [...element().querySelectorAll('button')].find((b) =>
      text(b).startsWith('Tight'),
    )!;
    tight.click();
    await fixture.whenStable();
    const req = http.expectOne((r) => r.url === '/api/valves/10/partners');
    expect(req.request.params.get('tolerancePercent')).toBe('2.5');
    req.flush({ ...LIST, partners: [] });
    await fixture.whenStable();
    expect(text(element())).toContain('No other in-stock valve of this type');
  });

  it("gives the hub's reason when the valve cannot be matched", async () => {
    http
      .expectOne((r) => r.url === '/api/valves/10/partners')
      .flush(
        { error: { code: 'no_sweep', message: 'KL-0010 has no complete anode-family sweep' } },
        { status: 409, statusText: 'Conflict' },
      );
    await fixture.whenStable();
    expect(text(element().querySelector('[role="status"]'))).toBe(
      'No partners can be sought: KL-0010 has no complete anode-family sweep',
    );
  });
});
