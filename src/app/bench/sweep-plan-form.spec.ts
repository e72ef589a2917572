import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { importProvidersFrom } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import type { HarnessLoader } from '@angular/cdk/testing';
import { MatAutocompleteHarness } from '@angular/material/autocomplete/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatButtonToggleHarness } from '@angular/material/button-toggle/testing';
import { MatCheckboxHarness } from '@angular/material/checkbox/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatDialogHarness } from '@angular/material/dialog/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatIconTestingModule } from '@angular/material/icon/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import type { SweepView } from '../../../shared/hub/messages';
import { benchView, sweepView, VALVE_TYPE_VIEWS } from '../../testing/fixtures';
import { valveView } from '../valves/valve-view-fixture';
import { SweepPlanForm } from './sweep-plan-form';

describe('SweepPlanForm', () => {
  let fixture: ComponentFixture<SweepPlanForm>;
  let loader: HarnessLoader;
  let http: HttpTestingController;

  async function render(canOverride = false) {
    TestBed.configureTestingModule({
      imports: [SweepPlanForm],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        importProvidersFrom(MatIconTestingModule),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SweepPlanForm);
    fixture.componentRef.setInput('bench', benchView());
    fixture.componentRef.setInput('valveTypes', VALVE_TYPE_VIEWS);
    fixture.componentRef.setInput('canOverride', canOverride);
    loader = TestbedHarnessEnvironment.loader(fixture);
    await fixture.whenStable();
  }

  async function chooseType(designation: string) {
    const select = await loader.getHarness(MatSelectHarness);
    await select.open();
    await select.clickOptions({ text: new RegExp(`^${designation}\\b`) });
  }

  const field = (label: string) =>
    loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }));
  const input = (name: string) =>
    loader.getHarness(MatInputHarness.with({ selector: `[formControlName=${name}]` }));
  const startButton = () => loader.getHarness(MatButtonHarness.with({ text: /Start sweep/ }));

  afterEach(() => http.verify());

  it('fills the plan from the chosen type and lists the generated grid steps', async () => {
    await render();
    await chooseType('12AX7');
    expect(await (await input('vaStopVolts')).getValue()).toBe('300');
    expect(await (await input('heaterVolts')).getValue()).toBe('12.6');
    const preset = VALVE_TYPE_VIEWS.find((t) => t.designation === '12AX7')!.defaultPlan;
    const steps = (fixture.nativeElement as HTMLElement).querySelectorAll('.step');
    expect(steps.length).toBeGreaterThan(1);
    // + 0 turns the preset's -0 into 0, as the list shows it.
    expect([...steps].map((s) => Number(s.textContent))).toEqual(preset.vg1Volts.map((v) => v + 0));
    expect(await (await startButton()).isDisabled()).toBe(false);
  });

  it('shows a message at Va stop above the type maximum and disables Start', async () => {
    await render();
    await chooseType('12AX7');
    await (await input('vaStopVolts')).setValue('400');

    expect(await (await field('Va stop')).getTextErrors()).toEqual([
      'Anode voltage 400 V is above the limit of 300 V',
    ]);
    expect(await (await startButton()).isDisabled()).toBe(true);

    await (await input('vaStopVolts')).setValue('300');
    expect(await (await field('Va stop')).getTextErrors()).toEqual([]);
    expect(await (await startButton()).isDisabled()).toBe(false);
  });

  it('warns of a cold cathode below a 15 s warm-up (common practice: 10-20 s) and still allows it', async () => {
    await render();
    await chooseType('12AX7');
    expect(await (await field('Warm-up')).getTextHints()).not.toContain(
      'cathode may still be cold: readings low',
    );
    await (await input('warmupSeconds')).setValue('2');
    expect(await (await field('Warm-up')).getTextHints()).toContain(
      'cathode may still be cold: readings low',
    );
    expect(await (await startButton()).isDisabled()).toBe(false);
  });

  it('holds an admin override to the bench limits, not the type ratings', async () => {
    await render(true);
    await chooseType('12AX7');
    await (await input('vaStopVolts')).setValue('400');
    expect(await (await startButton()).isDisabled()).toBe(true);

    await (await loader.getHarness(MatCheckboxHarness)).check();
    expect(await (await field('Va stop')).getTextErrors()).toEqual([]);
    expect(await (await startButton()).isDisabled()).toBe(false);

    await (await input('vaStopVolts')).setValue('600');
    expect(await (await field('Va stop')).getTextErrors()).toEqual([
      'Anode voltage 600 V is above the limit of 500 V',
    ]);
  });

  it('asks for confirmation before it posts the plan', async () => {
    await render();
    let started: SweepView | null = null;
    fixture.componentInstance.started.subscribe((s) => (started = s));
    await chooseType('12AX7');
    await (await input('valveLabel')).setValue('shelf 3 no. 12');
    await (await startButton()).click();

    const root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    const dialog = await root.getHarness(MatDialogHarness);
    expect(await dialog.getText()).toContain('Up to 300 V on the anode');
    expect(await dialog.getText()).toContain('Discharge capacitors');
    http.expectNone('/api/sweeps');

    const confirm = await root.getHarness(MatButtonHarness.with({ text: /Apply voltages/ }));
    const clicked = confirm.click();
    const req = await vi.waitFor(() => http.expectOne('/api/sweeps'));
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toMatchObject({
      benchId: 1,
      valveType: '12AX7',
      valveLabel: 'shelf 3 no. 12',
      plan: { kind: 'anode', vaStopVolts: 300, heaterVolts: 12.6 },
    });
    expect(req.request.body.override).toBeUndefined();
    req.flush(sweepView({ id: 12, status: 'pending' }), { status: 201, statusText: 'Created' });
    await clicked;
    expect(started!.id).toBe(12);
  });

  it('offers section 2 for a double triode only, and posts it in the plan', async () => {
    await render();
    await chooseType('EL34');
    const toggles = () => loader.getAllHarnesses(MatButtonToggleHarness.with({ text: /^[12]$/ }));
    expect(await toggles()).toHaveLength(0);
    await chooseType('12AX7');
    const [, second] = await toggles();
    await second.check();
    await (await startButton()).click();
    const root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    const confirm = await root.getHarness(MatButtonHarness.with({ text: /Apply voltages/ }));
    const clicked = confirm.click();
    const req = await vi.waitFor(() => http.expectOne('/api/sweeps'));
    expect(req.request.body.plan).toMatchObject({ kind: 'anode', section: 2 });
    req.flush(sweepView({ id: 13, status: 'pending' }), { status: 201, statusText: 'Created' });
    await clicked;
  });

  it('posts nothing when the confirmation is cancelled', async () => {
    await render();
    await chooseType('12AX7');
    await (await startButton()).click();
    const root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    await (await root.getHarness(MatButtonHarness.with({ text: 'Cancel' }))).click();
    expect(await root.getAllHarnesses(MatDialogHarness)).toHaveLength(0);
    http.expectNone('/api/sweeps');
  });

  it('shows the hub’s field messages beside the fields after a 422', async () => {
    await render();
    await chooseType('12AX7');
    await (await startButton()).click();
    const root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    const clicked = (
      await root.getHarness(MatButtonHarness.with({ text: /Apply voltages/ }))
    ).click();
    const req = await vi.waitFor(() => http.expectOne('/api/sweeps'));
    req.flush(
      {
        error: {
          code: 'plan_outside_limits',
          message: 'plan outside the limits: heater voltage 12.6 V is above the limit of 6.3 V',
          fields: {
            'plan.heaterVolts':
              'heater voltage 12.6 V is above the limit of 6.3 V (Bench A limits)',
          },
        },
      },
      { status: 422, statusText: 'Unprocessable Entity' },
    );
    await clicked;
    await fixture.whenStable();

    expect(await (await field('Heater')).getTextErrors()).toEqual([
      'Heater voltage 12.6 V is above the limit of 6.3 V (Bench A limits)',
    ]);
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('plan outside the limits');
  });

  it('blocks Start while the bench is offline', async () => {
    await render();
    fixture.componentRef.setInput('bench', benchView({ bridgeOnline: false }));
    await chooseType('12AX7');
    expect(await (await startButton()).isDisabled()).toBe(true);
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('Bench A is offline.');
  });

  it('takes the type and label from a picked valve record and posts its id', async () => {
    await render();
    const picker = await loader.getHarness(MatAutocompleteHarness);
    await picker.enterText('WK');
    const search = await vi.waitFor(() => http.expectOne((r) => r.url === '/api/valves'));
    expect(search.request.params.get('q')).toBe('WK');
    search.flush({ items: [valveView({ id: 7, type: 'EL34' })], total: 1, page: 1, pageSize: 10 });
    await fixture.whenStable();
    await vi.waitFor(async () => expect(await picker.isOpen()).toBe(true));
    await picker.selectOption({ text: /WK-0007/ });
    expect(await (await input('valveLabel')).getValue()).toBe('WK-0007');
    expect(await (await loader.getHarness(MatSelectHarness)).getValueText()).toMatch(/^EL34/);

    await (await startButton()).click();
    const root = TestbedHarnessEnvironment.documentRootLoader(fixture);
    const confirm = await root.getHarness(MatButtonHarness.with({ text: /Apply voltages/ }));
    const clicked = confirm.click();
    const req = await vi.waitFor(() => http.expectOne('/api/sweeps'));
    expect(req.request.body).toMatchObject({
      valveId: 7,
      valveType: 'EL34',
      valveLabel: 'WK-0007',
    });
    req.flush(sweepView({ id: 13, status: 'pending' }), { status: 201, statusText: 'Created' });
    await clicked;
  });
});
