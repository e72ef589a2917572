import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { importProvidersFrom, signal } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { provideEchartsCore } from 'ngx-echarts';
import { of, type Observable } from 'rxjs';
import type { SweepStatus } from '../../../shared/domain/sweep';
import type { BenchView } from '../../../shared/hub/messages';
import {
  benchView,
  pointsOf,
  SMALL_PLAN,
  storeSession,
  sweepView,
  VALVE_TYPE_VIEWS,
} from '../../testing/fixtures';
import type { Role } from '../core/auth';
import { LiveConnection, type SweepMessage } from '../core/live-connection';
import { BenchPage } from './bench-page';

/** Stands in for the socket: the page sees Bench A running sweep 7 with some points. */
class LiveStub {
  readonly benches = signal<BenchView[] | null>([benchView({}, 7)]);
  readonly connected = signal(true);
  readonly linkDown = signal(false);
  readonly lastError = signal(null);
  readonly aborted: number[] = [];
  readonly watched: number[] = [];
  /** Status the hub reports per sweep; running unless set. */
  readonly statuses = new Map<number, SweepStatus>();

  watchSweep(id: number): Observable<SweepMessage> {
    this.watched.push(id);
    return of<SweepMessage[]>(
      { type: 'sweep', sweep: sweepView({ id, status: this.statuses.get(id) ?? 'running' }) },
      { type: 'points', sweepId: id, points: pointsOf(SMALL_PLAN, 5).slice(0, 4) },
    );
  }

  abortSweep(id: number): boolean {
    this.aborted.push(id);
    return true;
  }
}

describe('BenchPage', () => {
  let fixture: ComponentFixture<BenchPage>;
  let http: HttpTestingController;
  let live: LiveStub;

  async function render(role: Role, benches = [benchView({}, 7)]) {
    localStorage.clear();
    storeSession(role);
    live = new LiveStub();
    live.benches.set(benches);
    TestBed.configureTestingModule({
      imports: [BenchPage],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        importProvidersFrom(MatIconTestingModule),
        provideEchartsCore({ echarts: () => import('../echarts-setup') }),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        { provide: LiveConnection, useValue: live },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(BenchPage);
    fixture.detectChanges();
    http.expectOne('/api/benches').flush(benches);
    http.expectOne('/api/valve-types').flush(VALVE_TYPE_VIEWS);
    await fixture.whenStable();
  }

  const page = () => fixture.nativeElement as HTMLElement;
  const abortButton = () =>
    [...page().querySelectorAll('button')].find((b) => b.textContent?.includes('Abort sweep'));

  afterEach(() => {
    http.verify();
    localStorage.clear();
  });

  it('shows a viewer the live sweep but no plan form and no abort', async () => {
    await render('viewer');
    expect(live.watched).toEqual([7]);
    expect(page().textContent).toContain('Sweep #7');
    expect(page().querySelector('app-live-sweep')).not.toBeNull();
    expect(page().querySelector('app-sweep-plan-form')).toBeNull();
    expect(abortButton()).toBeUndefined();

    document.dispatchEvent(new KeyboardEvent('keydown', { key: 'Escape' }));
    expect(live.aborted).toEqual([]);
    http.expectNone('/api/sweeps/7/abort');
  });

  it('gives a technician the plan form and an abort that goes out over socket and REST', async () => {
    await render('technician');
    expect(page().querySelector('app-sweep-plan-form')).not.toBeNull();
    const abort = abortButton();
    expect(abort).toBeDefined();

    abort!.click();
    expect(live.aborted).toEqual([7]);
    http.expectOne({ method: 'POST', url: '/api/sweeps/7/abort' }).flush({});
  });

  it('aborts the running sweep on Escape', async () => {
    await render('technician');
    document.dispatchEvent(new KeyboardEvent('keydown', { key: 'Escape' }));
    expect(live.aborted).toEqual([7]);
    http.expectOne({ method: 'POST', url: '/api/sweeps/7/abort' }).flush({});
  });

  it('shows the latest reading with units', async () => {
    await render('technician');
    const readouts = page().querySelector('.readouts')!.textContent!.replace(/\s+/g, '');
    // The fourth point of the first curve: Va 150 V, Ia 1.2 mA, so Pa 0.18 W.
    expect(readouts).toContain('Va150.0V');
    expect(readouts).toContain('Vg10.00V');
    expect(readouts).toContain('Ia1.200mA');
    expect(readouts).toContain('Pa0.180W');
    expect(readouts).not.toContain('Ig2');
    expect(page().textContent).toContain('4 / 15 points');
  });

  it('shows the latest stored sweep of an idle bench, without an abort', async () => {
    await render('technician', [benchView()]);
    live.statuses.set(5, 'complete');
    const req = http.expectOne((r) => r.url === '/api/sweeps');
    expect(req.request.params.get('benchId')).toBe('1');
    expect(req.request.params.get('pageSize')).toBe('1');
    req.flush({
      items: [sweepView({ id: 5, status: 'complete' })],
      total: 1,
      page: 1,
      pageSize: 1,
    });
    await fixture.whenStable();
    expect(live.watched).toEqual([5]);
    expect(page().textContent).toContain('Sweep #5');
    expect(page().textContent).toContain('Every curve was measured.');
    expect(abortButton()).toBeUndefined();
  });
});
