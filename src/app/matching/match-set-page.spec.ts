import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { importProvidersFrom } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { provideRouter } from '@angular/router';
import { provideEchartsCore } from 'ngx-echarts';
import { storeSession, VALVE_TYPE_VIEWS } from '../../testing/fixtures';
import type { Role } from '../core/auth';
import type { MatchSetDetail } from './match-sets-api';
import { MatchSetPage } from './match-set-page';
import { matchSetDetail } from './matching-fixtures';

describe('MatchSetPage', () => {
  let fixture: ComponentFixture<MatchSetPage>;
  let http: HttpTestingController;
  const element = () => fixture.nativeElement as HTMLElement;
  const text = (el: Element | null) => (el?.textContent ?? '').replace(/\s+/g, ' ').trim();
  const buttons = () => [...element().querySelectorAll('button, a[mat-stroked-button]')].map(text);

  async function render(role: Role, set: MatchSetDetail = matchSetDetail()) {
    storeSession(role);
    TestBed.configureTestingModule({
      imports: [MatchSetPage],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        provideEchartsCore({ echarts: () => import('../echarts-setup') }),
        importProvidersFrom(MatIconTestingModule),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(MatchSetPage);
    fixture.componentRef.setInput('id', '3');
    await fixture.whenStable();
    http.expectOne('/api/valve-types').flush(VALVE_TYPE_VIEWS);
    http.expectOne('/api/match-sets/3').flush(set);
    await fixture.whenStable();
    // The overlaid curves are the member-curves spec's business: answer them empty.
    for (const req of http.match((r) => r.url.startsWith('/api/sweeps/'))) {
      req.flush({}, { status: 404, statusText: 'Not Found' });
    }
    await fixture.whenStable();
  }

  afterEach(() => {
    http.verify();
    localStorage.clear();
    document.querySelectorAll('.cdk-overlay-container').forEach((e) => e.remove());
  });

  it('shows the code, type, status and every member with its readings in mA and µS', async () => {
    await render('technician');
    const title = element().querySelector('h1')!;
    expect(text(title.querySelector('.readout'))).toBe('MS-0003');
    expect(text(title.querySelector('.type'))).toBe('EL34 quad');
    expect(text(title.querySelector('app-match-set-status-chip'))).toBe('Reserved');
    const rows = [...element().querySelectorAll('table.members tbody tr')];
    expect(rows).toHaveLength(4);
    const cells = [...rows[0].querySelectorAll('td')].map(text);
    expect(cells[0]).toBe('KL-0010');
    expect(cells[1]).toBe('Strong · 88 %');
    const readings = [...rows[0].querySelectorAll('td')[3].querySelectorAll('.reading')];
    expect(readings.map(text)).toEqual(['Ia 87.6 mA', 'gm 11221 µS']);
    expect(cells[4]).toContain('Bench A');
    expect(cells[5]).toBe(
      'Va 0–400 V in 10 V steps, Vg1 0 to -20 V (5 curves), Vg2 250 V, heater 6.3 V',
    );
    expect(rows[0].querySelector('a')!.getAttribute('href')).toBe('/valves/10');
    const header = text(element().querySelectorAll('table.members th')[3]);
    expect(header).toBe('typical Va 250 V, Vg1 -13.5 V, Vg2 250 V');
  });

  it('gives a technician the report, release, sale and buyer-link actions', async () => {
    await render('technician');
    expect(buttons()).toEqual(
      expect.arrayContaining([
        'Send report',
        'Download PDF',
        'Printable report',
        'Release',
        'Mark sold',
        'Make a buyer link',
      ]),
    );
    const printable = [...element().querySelectorAll('a')].find(
      (a) => text(a) === 'Printable report',
    );
    expect(printable?.getAttribute('href')).toBe('/match-sets/3/report');
  });

  it('leaves a viewer only the report to read or download', async () => {
    await render('viewer');
    const shown = buttons();
    expect(shown).toEqual(expect.arrayContaining(['Download PDF', 'Printable report']));
    for (const action of ['Send report', 'Release', 'Mark sold', 'Make a buyer link']) {
      expect(shown).not.toContain(action);
    }
  });

  it('offers no release or sale once a set is sold', async () => {
    await render('admin', matchSetDetail({ status: 'sold' }));
    expect(buttons()).not.toContain('Release');
    expect(buttons()).not.toContain('Mark sold');
    expect(buttons()).toContain('Send report');
  });

  it('releases the set after the confirmation and shows its new status', async () => {
    await render('technician');
    const release = [...element().querySelectorAll('button')].find((b) => text(b) === 'Release')!;
    release.click();
    await fixture.whenStable();
    const dialog = document.querySelector('mat-dialog-container')!;
    expect(text(dialog)).toContain('KL-0010, KL-0011, KL-0013, KL-0014 go back to stock');
    const confirm = [...dialog.querySelectorAll('button')].find((b) => text(b) === 'Release set')!;
    confirm.click();
    await fixture.whenStable();
    const req = http.expectOne('/api/match-sets/3/release');
    expect(req.request.method).toBe('POST');
    req.flush(matchSetDetail({ status: 'released' }));
    await fixture.whenStable();
    expect(text(element().querySelector('app-match-set-status-chip'))).toBe('Released');
    expect(buttons()).not.toContain('Release');
  });

  it('lists the mailings of the report and the buyer links with their expiry', async () => {
    await render(
      'technician',
      matchSetDetail({
        mailings: [
          { to: 'buyer@example.com', at: '2026-12-01T11:00:00.000Z', by: 'tech', messageId: 'm1' },
        ],
        shares: [
          { id: 4, expiresAt: '2099-01-01T00:00:00.000Z', revokedAt: null },
          { id: 2, expiresAt: '2099-01-01T00:00:00.000Z', revokedAt: '2026-12-01T12:00:00.000Z' },
        ],
      }),
    );
    expect(text(element().querySelector('.mailings li'))).toContain('buyer@example.com');
    const links = [...element().querySelectorAll('.links li')].map((li) =>
      [...li.children].map(text),
    );
    expect(links[0]).toEqual([
      'Link #4',
      expect.stringMatching(/^valid until 2099-01-01 /),
      'Withdraw',
    ]);
    expect(links[1]).toEqual(['Link #2', expect.stringMatching(/^withdrawn 2026-12-01 /)]);
  });

  it('shows a new buyer link once, with a copy button, and reloads the list', async () => {
    await render('technician');
    const make = [...element().querySelectorAll('button')].find(
      (b) => text(b) === 'Make a buyer link',
    )!;
    make.click();
    const req = http.expectOne('/api/match-sets/3/share');
    expect(req.request.body).toEqual({ expiresInDays: 30 });
    req.flush({
      id: 5,
      url: 'http://hub.test/shared/abcdefghijklmnopqrstuvwx',
      reportUrl: 'http://hub.test/api/shared/match-sets/abcdefghijklmnopqrstuvwx/report.pdf',
      token: 'abcdefghijklmnopqrstuvwx',
      expiresAt: '2099-01-01T00:00:00.000Z',
    });
    http.expectOne('/api/match-sets/3').flush(
      matchSetDetail({
        shares: [{ id: 5, expiresAt: '2099-01-01T00:00:00.000Z', revokedAt: null }],
      }),
    );
    await fixture.whenStable();
    expect(text(element().querySelector('.created code'))).toBe(
      'http://hub.test/shared/abcdefghijklmnopqrstuvwx',
    );
    expect(buttons()).toContain('Copy link');
  });
});
