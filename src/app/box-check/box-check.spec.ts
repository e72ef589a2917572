import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { importProvidersFrom, signal } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { provideRouter } from '@angular/router';
import { Subject } from 'rxjs';
import type { BenchView, HubToBrowser, QuickTestView } from '../../../shared/hub/messages';
import { benchView, storeSession } from '../../testing/fixtures';
import { LiveConnection } from '../core/live-connection';
import { BoxCheck } from './box-check';

/** Stands in for the socket: hub messages are pushed by the test. */
class LiveStub {
  readonly benches = signal<BenchView[] | null>([benchView({ id: 3, name: 'Bench C' })]);
  readonly connected = signal(true);
  readonly linkDown = signal(false);
  readonly lastError = signal(null);
  readonly messages$ = new Subject<HubToBrowser>();
  readonly abortedQuickTests: number[] = [];

  abortQuickTest(id: number): boolean {
    this.abortedQuickTests.push(id);
    return true;
  }
}

const VALVE = {
  id: 42,
  label: 'KL-0007',
  type: '12AX7',
  maker: null,
  dateCode: null,
  originKind: null,
  originText: null,
  location: null,
  status: 'in-stock',
  notes: null,
  grade: null,
  percentOfNominal: null,
  sweepCount: 0,
  lastSweepAt: null,
  createdBy: null,
  updatedBy: null,
  createdAt: '2026-12-01T10:00:00.000Z',
  updatedAt: '2026-12-01T10:00:00.000Z',
};

function quickTest(over: Partial<QuickTestView> = {}): QuickTestView {
  return {
    id: 9,
    benchId: 3,
    valveType: '12AX7',
    valveId: 42,
    valveLabel: 'KL-0007',
    parts: ['leakage', 'gm'],
    status: 'running',
    currentPart: 'leakage',
    warmupLeftSeconds: 14,
    stepsDone: 0,
    stepCount: 2,
    results: [
      { part: 'leakage', status: 'running', message: null, errorCode: null, result: null },
      { part: 'gm', status: 'pending', message: null, errorCode: null, result: null },
    ],
    reference: {
      valveType: '12AX7',
      vaVolts: 250,
      vg2Volts: 0,
      vg1Volts: -2,
      heaterVolts: 12.6,
      reducedHeaterVolts: 11.3,
      iaMilliamps: 1.2,
      gmMicrosiemens: 1600,
      source: 'test figures',
      emissionVolts: null,
      expectedEmissionMilliamps: null,
    },
    grade: null,
    endMessage: null,
    operator: 'tech',
    createdAt: '2026-12-01T11:00:00.000Z',
    startedAt: '2026-12-01T11:00:00.000Z',
    endedAt: null,
    ...over,
  };
}

const GASSY = quickTest({
  status: 'complete',
  currentPart: null,
  warmupLeftSeconds: 0,
  stepsDone: 2,
  results: [
    {
      part: 'leakage',
      status: 'done',
      message: null,
      errorCode: null,
      result: {
        part: 'leakage',
        pairs: [{ pair: 'heater-cathode', volts: 100, microamps: 0.4, overRange: false }],
      },
    },
    {
      part: 'gm',
      status: 'done',
      message: null,
      errorCode: null,
      result: {
        part: 'gm',
        measurement: {
          vaVolts: 250,
          vg1Volts: -2,
          heaterVolts: 12.6,
          gridStepVolts: 0.1,
          iaMilliamps: 1.05,
          gmMicrosiemens: 1480,
          method: 'central',
        },
        nominalGmMicrosiemens: 1600,
        gmPercent: 92.5,
        nominalIaMilliamps: 1.2,
        iaPercent: 87.5,
      },
    },
  ] as QuickTestView['results'],
  grade: { grade: 'gassy', reason: 'reverse grid current 0.6 uA above 0.2 uA', findings: [] },
  endedAt: '2026-12-01T11:01:00.000Z',
});

describe('BoxCheck', () => {
  let fixture: ComponentFixture<BoxCheck>;
  let http: HttpTestingController;
  let live: LiveStub;

  async function render() {
    localStorage.clear();
    storeSession('technician');
    live = new LiveStub();
    TestBed.configureTestingModule({
      imports: [BoxCheck],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideRouter([]),
        importProvidersFrom(MatIconTestingModule),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        { provide: LiveConnection, useValue: live },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(BoxCheck);
    fixture.detectChanges();
    http.expectOne('/api/benches').flush([benchView({ id: 3, name: 'Bench C' })]);
    await fixture.whenStable();
  }

  const page = () => fixture.nativeElement as HTMLElement;
  const labelInput = () => page().querySelector<HTMLInputElement>('input[name=label]')!;
  const button = (text: string) =>
    [...page().querySelectorAll('button')].find((b) => b.textContent?.includes(text));

  async function scan(label: string) {
    const input = labelInput();
    input.value = label;
    input.dispatchEvent(new Event('input'));
    input.dispatchEvent(new KeyboardEvent('keydown', { key: 'Enter' }));
    const lookup = http.expectOne((r) => r.url === '/api/valves');
    expect(lookup.request.params.get('q')).toBe(label);
    lookup.flush({ items: [VALVE], total: 1, page: 1, pageSize: 10 });
    await fixture.whenStable();
  }

  async function startTest() {
    button('Test')!.click();
    const req = http.expectOne('/api/quick-tests');
    req.flush(quickTest(), { status: 201, statusText: 'Created' });
    await fixture.whenStable();
    return req;
  }

  afterEach(() => http.verify());

  it('looks the label up, shows the type and starts the quick test with the right body', async () => {
    await render();
    await scan('KL-0007');
    expect(page().querySelector('.found')?.textContent).toContain('12AX7');
    button('Test')!.click();
    const req = http.expectOne('/api/quick-tests');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ benchId: 3, valveType: '12AX7', valveId: 42 });
    req.flush(quickTest(), { status: 201, statusText: 'Created' });
    await fixture.whenStable();
    expect(page().querySelector('.progress')?.textContent).toContain('14 s');
    expect(button('Abort')).toBeDefined();
  });

  it('starts on Enter alone when auto-start is on', async () => {
    await render();
    page().querySelector<HTMLElement>('mat-slide-toggle button')!.click();
    await fixture.whenStable();
    await scan('KL-0007');
    const req = http.expectOne('/api/quick-tests');
    expect(req.request.body).toEqual({ benchId: 3, valveType: '12AX7', valveId: 42 });
    req.flush(quickTest(), { status: 201, statusText: 'Created' });
    await fixture.whenStable();
  });

  it('adds a row with the grade and reason when the quick test finishes', async () => {
    await render();
    await scan('KL-0007');
    await startTest();
    expect(page().querySelectorAll('table.results tbody tr').length).toBe(0);
    live.messages$.next({ type: 'quick-test', quickTest: GASSY });
    await fixture.whenStable();
    const rows = page().querySelectorAll('table.results tbody tr');
    expect(rows.length).toBe(1);
    expect(rows[0].textContent).toContain('KL-0007');
    expect(rows[0].textContent).toContain('Gassy');
    expect(rows[0].textContent).toContain('reverse grid current 0.6 uA above 0.2 uA');
    expect(rows[0].querySelector('.tone-fail')).not.toBeNull();
    expect(rows[0].querySelector('a')?.getAttribute('href')).toBe('/valves/42');
    expect(page().querySelector('.figures')?.textContent).toContain('0.40 µA');
    expect(page().textContent).toContain('1.48 mA/V');
    expect(button('Abort')).toBeUndefined();
    expect(document.activeElement).toBe(labelInput());
  });

  it('ignores quick tests of other benches', async () => {
    await render();
    await scan('KL-0007');
    await startTest();
    live.messages$.next({ type: 'quick-test', quickTest: { ...GASSY, id: 10 } });
    await fixture.whenStable();
    expect(page().querySelectorAll('table.results tbody tr').length).toBe(0);
  });

  it('aborts over the socket and over REST', async () => {
    await render();
    await scan('KL-0007');
    await startTest();
    button('Abort')!.click();
    const req = http.expectOne('/api/quick-tests/9/abort');
    expect(req.request.method).toBe('POST');
    req.flush({}, { status: 202, statusText: 'Accepted' });
    await fixture.whenStable();
    expect(live.abortedQuickTests).toEqual([9]);
    live.messages$.next({
      type: 'quick-test',
      quickTest: quickTest({ status: 'aborted', endMessage: 'aborted on request; outputs off' }),
    });
    await fixture.whenStable();
    const row = page().querySelector('table.results tbody tr');
    expect(row?.textContent).toContain('Aborted');
    expect(row?.textContent).toContain('aborted on request; outputs off');
  });
});

describe('partSummary', () => {
  it('shows a grid current that rounds to zero without a minus sign', async () => {
    const { partSummary } = await import('./part-figures');
    const summary = partSummary({
      part: 'grid-current',
      status: 'done',
      message: null,
      errorCode: null,
      result: {
        part: 'grid-current',
        vaVolts: 250,
        vg1Volts: -2,
        vg2Volts: 0,
        iaMilliamps: 1,
        ig1Microamps: -0.001,
        gridKiloohms: 1000,
      },
    });
    expect(summary.figures[0].value).toBe('0.00 µA');
  });
});
