import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialogRef } from '@angular/material/dialog';
import { MatSelectHarness } from '@angular/material/select/testing';
import { NewTypeDialog } from './new-type-dialog';

// The figures typed here are test choices, not a data sheet.
const TRIODE: Record<string, string> = {
  designation: '6BX4',
  equivalents: 'EX84, 6BX4A',
  base: 'B9A',
  heaterVolts: '6.3',
  heaterAmps: '0.3',
  vaVolts: '200',
  vg1Volts: '-3',
  iaMilliamps: '8',
  gmMilliampsPerVolt: '4.4',
  raKiloohms: '7.5',
  mu: '33',
  pointSource: 'workshop test sheet',
  vaMaxVolts: '300',
  paMaxWatts: '2.5',
  ratingsSource: 'workshop test sheet',
};

describe('NewTypeDialog', () => {
  let fixture: ComponentFixture<NewTypeDialog>;
  let http: HttpTestingController;
  const close = vi.fn();
  const element = () => fixture.nativeElement as HTMLElement;
  const addButton = () =>
    [...element().querySelectorAll('button')].find((b) => b.textContent!.includes('Add type'))!;

  async function fill(values: Record<string, string>) {
    for (const [name, value] of Object.entries(values)) {
      const input = element().querySelector(
        `[formcontrolname=${name}], [data-field=${name}]`,
      ) as HTMLInputElement;
      if (!input) throw new Error(`no field ${name}`);
      input.value = value;
      input.dispatchEvent(new Event('input'));
    }
    await fixture.whenStable();
  }

  beforeEach(async () => {
    close.mockReset();
    TestBed.configureTestingModule({
      imports: [NewTypeDialog],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        { provide: MatDialogRef, useValue: { close } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(NewTypeDialog);
    await fixture.whenStable();
  });

  afterEach(() => http.verify());

  it('posts a triode with gm in µS, no screen figures, and closes with the new type', async () => {
    expect(addButton().disabled).toBe(true);
    await fill(TRIODE);
    expect(addButton().disabled).toBe(false);
    addButton().click();
    const req = http.expectOne((r) => r.method === 'POST' && r.url === '/api/valve-types');
    expect(req.request.body).toEqual({
      designation: '6BX4',
      equivalents: ['EX84', '6BX4A'],
      valveClass: 'triode',
      base: 'B9A',
      sections: 1,
      heaterVolts: 6.3,
      heaterAmps: 0.3,
      operatingPoints: [
        {
          vaVolts: 200,
          vg2Volts: null,
          vg1Volts: -3,
          iaMilliamps: 8,
          ig2Milliamps: null,
          gmMicrosiemens: 4400,
          raKiloohms: 7.5,
          mu: 33,
          source: 'workshop test sheet',
          confidence: null,
        },
      ],
      ratings: {
        vaMaxVolts: 300,
        vg2MaxVolts: null,
        paMaxWatts: 2.5,
        pg2MaxWatts: null,
        vhkMaxVolts: null,
        source: 'workshop test sheet',
        confidence: null,
      },
      model: null,
      notes: null,
    });
    req.flush({ designation: '6BX4' }, { status: 201, statusText: 'Created' });
    expect(close).toHaveBeenCalledWith({ designation: '6BX4' });
  });

  it('asks a pentode for its screen figures and a model for all its parameters', async () => {
    await fill(TRIODE);
    const loader = TestbedHarnessEnvironment.loader(fixture);
    await (await loader.getHarness(MatSelectHarness)).clickOptions({ text: 'Pentode' });
    await fixture.whenStable();
    expect(element().textContent).toContain("A Pentode needs the point's Vg2.");
    expect(addButton().disabled).toBe(true);
    await fill({ vg2Volts: '150', vg2MaxVolts: '200' });
    expect(addButton().disabled).toBe(false);

    (element().querySelector('mat-checkbox input') as HTMLInputElement).click();
    await fixture.whenStable();
    expect(element().querySelector('[data-field=modelKg2]')).not.toBeNull();
    expect(element().textContent).toContain('Every model parameter must be a positive number.');
    await fill({
      modelMu: '30',
      modelEx: '1.35',
      modelKg1: '600',
      modelKp: '50',
      modelKvb: '20',
      modelKg2: '4000',
      modelSource: 'own fit',
    });
    addButton().click();
    const req = http.expectOne('/api/valve-types');
    expect(req.request.body.model).toEqual({
      kind: 'pentode',
      params: { mu: 30, ex: 1.35, kg1: 600, kp: 50, kvb: 20, kg2: 4000 },
      source: 'own fit',
    });
    expect(req.request.body.operatingPoints[0].vg2Volts).toBe(150);
    req.flush(null);
  });

  it("lists the hub's reasons for each refused field", async () => {
    await fill({ ...TRIODE, vaVolts: '350' });
    addButton().click();
    http.expectOne('/api/valve-types').flush(
      {
        error: {
          code: 'validation_failed',
          message: 'The type has problems.',
          fields: {
            'operatingPoints.0.vaVolts': 'above Va max 300 V',
            'ratings.paMaxWatts': 'too small',
          },
        },
      },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();
    const alert = element().querySelector('[role=alert]')!.textContent!;
    expect(alert).toContain('The type was not added:');
    expect(alert).toContain('Reference point Va: above Va max 300 V');
    expect(alert).toContain('Pa max: too small');
    expect(close).not.toHaveBeenCalled();
  });
});
