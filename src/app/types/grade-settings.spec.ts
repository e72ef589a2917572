import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { storeSession } from '../../testing/fixtures';
import { GradeSettings } from './grade-settings';

describe('GradeSettings', () => {
  let fixture: ComponentFixture<GradeSettings>;
  let http: HttpTestingController;
  const element = () => fixture.nativeElement as HTMLElement;
  const settings = (strong: number, fair: number) => ({
    labelPrefix: 'KL',
    labelDigits: 4,
    nextLabelNumber: 20,
    gradeThresholds: { strongMinPercent: strong, fairMinPercent: fair },
  });
  const setField = (name: string, value: string) => {
    const input = element().querySelector(`[formcontrolname=${name}]`) as HTMLInputElement;
    input.value = value;
    input.dispatchEvent(new Event('input'));
  };

  async function render(role: 'admin' | 'viewer') {
    storeSession(role);
    TestBed.configureTestingModule({
      imports: [GradeSettings],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(GradeSettings);
    http.expectOne('/api/settings').flush(settings(85, 60));
    await fixture.whenStable();
  }

  afterEach(() => {
    http.verify();
    localStorage.clear();
  });

  it('explains the common-practice defaults and shows the workshop thresholds', async () => {
    await render('viewer');
    const text = element().textContent!.replace(/\s+/g, ' ');
    expect(text).toContain('strong from 85 %');
    expect(text).toContain('data-sheet values are averages');
    expect(text).toContain('60-70 % of nominal is usually replaced');
    expect(text).toContain('graded by its gm');
    expect(text).toContain('Ia is shown beside gm but does not grade');
    expect(element().querySelector('form')).toBeNull();
  });

  it('lets an admin change the thresholds, refusing strong at or below fair', async () => {
    await render('admin');
    setField('strongMinPercent', '55');
    await fixture.whenStable();
    (element().querySelector('button[type=submit]') as HTMLButtonElement).click();
    await fixture.whenStable();
    http.expectNone('/api/settings');
    expect(element().textContent).toContain('must be above');

    setField('strongMinPercent', '90');
    await fixture.whenStable();
    (element().querySelector('button[type=submit]') as HTMLButtonElement).click();
    const req = http.expectOne((r) => r.method === 'PUT' && r.url === '/api/settings');
    expect(req.request.body).toEqual({
      gradeThresholds: { strongMinPercent: 90, fairMinPercent: 60 },
    });
    req.flush(settings(90, 60));
    await fixture.whenStable();
    expect(element().textContent).toContain('Saved.');
  });
});
