import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';
import { storeSession } from '../../testing/fixtures';
import type { WorkshopSettingsView } from './settings-api';
import { WorkshopSettings } from './workshop-settings';

describe('WorkshopSettings', () => {
  let fixture: ComponentFixture<WorkshopSettings>;
  let http: HttpTestingController;
  const element = () => fixture.nativeElement as HTMLElement;
  const text = () => element().textContent!.replace(/\s+/g, ' ');
  const SETTINGS: WorkshopSettingsView = {
    labelPrefix: 'KL',
    labelDigits: 4,
    nextLabelNumber: 25,
    gradeThresholds: { strongMinPercent: 80, fairMinPercent: 65 },
    quickTestLimits: {
      reducedHeaterMaxDropPercent: 10,
      gasMaxMicroamps: 0.2,
      leakageMaxMicroamps: 10,
      electrodeLeakageMaxMicroamps: 2,
      shortMinMicroamps: 100,
    },
  };
  const setField = (name: string, value: string) => {
    const input = (element().querySelector(`[formcontrolname=${name}]`) ??
      element().querySelector(`#limit-${name}`)) as HTMLInputElement;
    input.value = value;
    input.dispatchEvent(new Event('input'));
  };
  const submit = (label: string) =>
    (
      [...element().querySelectorAll('button[type=submit]')].find((b) =>
        b.textContent!.includes(label),
      ) as HTMLButtonElement
    ).click();

  beforeEach(async () => {
    storeSession('admin');
    TestBed.configureTestingModule({
      imports: [WorkshopSettings],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        provideRouter([]),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(WorkshopSettings);
    http.expectOne('/api/settings').flush(SETTINGS);
    await fixture.whenStable();
  });

  afterEach(() => {
    http.verify();
    localStorage.clear();
  });

  it('shows the label scheme with the next label and every limit with its unit and basis', () => {
    expect(text()).toContain('Next label: KL-0025');
    const gas = element().querySelector('#limit-gasMaxMicroamps') as HTMLInputElement;
    expect(Number(gas.value)).toBe(0.2);
    expect(text()).toContain('µA');
    expect(text()).toContain('common practice');
    expect(text()).toContain('strong from 80 %, fair from 65 %');
  });

  it('previews the next label as the scheme is edited', async () => {
    setField('labelPrefix', 'wk');
    setField('labelDigits', '5');
    await fixture.whenStable();
    expect(text()).toContain('Next label: WK-00025');
  });

  it('saves the limits and refuses a short limit at or below a leakage limit', async () => {
    setField('shortMinMicroamps', '5');
    await fixture.whenStable();
    submit('Save quick-test limits');
    await fixture.whenStable();
    http.expectNone('/api/settings');
    expect(text()).toContain('"Short from" must be above both leakage limits.');

    setField('shortMinMicroamps', '200');
    setField('gasMaxMicroamps', '0.5');
    await fixture.whenStable();
    submit('Save quick-test limits');
    const req = http.expectOne({ method: 'PUT', url: '/api/settings' });
    expect(req.request.body.quickTestLimits).toMatchObject({
      shortMinMicroamps: 200,
      gasMaxMicroamps: 0.5,
    });
    req.flush({
      ...SETTINGS,
      quickTestLimits: {
        ...SETTINGS.quickTestLimits,
        shortMinMicroamps: 200,
        gasMaxMicroamps: 0.5,
      },
    });
    await fixture.whenStable();
    expect(text()).toContain('Saved. Quick tests started from now on use these limits.');
  });

  it("shows the hub's refusal with its message", async () => {
    setField('labelPrefix', 'AB');
    await fixture.whenStable();
    submit('Save label scheme');
    http
      .expectOne({ method: 'PUT', url: '/api/settings' })
      .flush(
        { error: { code: 'validation_failed', message: 'labelPrefix: 1 to 8 capital letters' } },
        { status: 400, statusText: 'Bad Request' },
      );
    await fixture.whenStable();
    expect(text()).toContain('labelPrefix: 1 to 8 capital letters');
  });
});
