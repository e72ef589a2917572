import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { importProvidersFrom } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { provideRouter, Router } from '@angular/router';
import { provideEchartsCore } from 'ngx-echarts';
import { authInterceptor } from '../core/auth-interceptor';
import { SESSION_STORAGE_KEY } from '../core/auth';
import { matchReportFixture } from './match-report-fixture';
import { SharedReportPage } from './shared-report-page';

const TOKEN = 'Zq3vK9pXw2LmN8rT5yB1cD4fG7hJ0kQe';

describe('SharedReportPage', () => {
  let fixture: ComponentFixture<SharedReportPage>;
  let http: HttpTestingController;
  let el: HTMLElement;

  beforeEach(async () => {
    localStorage.removeItem(SESSION_STORAGE_KEY);
    TestBed.configureTestingModule({
      imports: [SharedReportPage],
      providers: [
        provideRouter([]),
        // The real interceptor: signed out, it must send no token and leave errors to the page.
        provideHttpClient(withInterceptors([authInterceptor])),
        provideHttpClientTesting(),
        importProvidersFrom(MatIconTestingModule),
        provideEchartsCore({ echarts: () => import('../echarts-setup') }),
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SharedReportPage);
    fixture.componentRef.setInput('token', TOKEN);
    el = fixture.nativeElement as HTMLElement;
    await fixture.whenStable();
  });

  afterEach(() => http.verify());

  const answer = async (body: object, status = 200, statusText = 'OK') => {
    const req = http.expectOne(`/api/shared/match-sets/${TOKEN}`);
    expect(req.request.headers.has('Authorization')).toBe(false);
    req.flush(body, { status, statusText });
    await fixture.whenStable();
  };

  it('shows the report, when the link expires and the PDF through the token', async () => {
    expect(el.textContent).toContain('Loading the report');
    await answer({ ...matchReportFixture(), expiresAt: '2026-12-03T14:00:00.000Z' });
    expect(el.querySelector('h1')!.textContent!.trim()).toBe('Match report MS-0007');
    expect(el.querySelectorAll('table.members tbody tr')).toHaveLength(2);
    expect(el.querySelector('.toolbar')!.textContent).toMatch(/works until\s+3 Dec 2026/);
    const pdf = [...el.querySelectorAll('a')].find((a) => a.textContent!.includes('Download PDF'))!;
    expect(pdf.getAttribute('href')).toBe(`/api/shared/match-sets/${TOKEN}/report.pdf`);
  });

  it('leads nowhere else in the product', async () => {
    await answer({ ...matchReportFixture(), expiresAt: '2026-12-03T14:00:00.000Z' });
    const links = [...el.querySelectorAll('a')].map((a) => a.getAttribute('href'));
    expect(links).toEqual([`/api/shared/match-sets/${TOKEN}/report.pdf`]);
    expect(el.querySelector('nav, app-shell')).toBeNull();
  });

  it('says plainly that an expired or withdrawn link (410) no longer works', async () => {
    const router = TestBed.inject(Router);
    const navigate = vi.spyOn(router, 'navigate');
    await answer(
      { error: { code: 'share_gone', message: 'this link has expired or was withdrawn' } },
      410,
      'Gone',
    );
    expect(el.querySelector('h1')!.textContent!.trim()).toBe(
      'This link has expired or was withdrawn',
    );
    expect(el.textContent).toContain('Ask the workshop');
    expect(el.querySelector('app-match-report-view')).toBeNull();
    expect(navigate).not.toHaveBeenCalled();
  });

  it('says an unknown link (404) leads to no report', async () => {
    await answer({ error: { code: 'share_not_found', message: 'no such link' } }, 404, 'Not Found');
    expect(el.querySelector('h1')!.textContent!.trim()).toBe('No report at this link');
    expect(el.textContent).toContain('whole address');
  });

  it('says when the hub cannot be reached at all', async () => {
    await answer({}, 0, 'Unknown Error');
    expect(el.querySelector('h1')!.textContent!.trim()).toBe('The report could not be loaded');
    expect(el.textContent).toContain('The hub cannot be reached');
  });
});
