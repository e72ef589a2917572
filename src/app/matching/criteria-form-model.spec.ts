import { TestBed } from '@angular/core/testing';
import { NonNullableFormBuilder } from '@angular/forms';
import {
  korenPentodeIa,
  korenTriodeIa,
  type KorenPentodeParams,
  type KorenTriodeParams,
} from '../../../shared/physics/koren';
import { VALVE_TYPE_VIEWS } from '../../testing/fixtures';
import type { ValveTypeView } from '../core/valve-types-api';
import { driveDefault, idleDefault, windowDefault } from './criteria-defaults';
import {
  buildCriteriaForm,
  criteriaDefaults,
  criteriaValue,
  runRequest,
  syncCriteriaControls,
  type CriteriaForm,
} from './criteria-form-model';

const typeOf = (designation: string): ValveTypeView =>
  VALVE_TYPE_VIEWS.find((t) => t.designation === designation)!;

function formFor(designation: string): CriteriaForm {
  const form = buildCriteriaForm(TestBed.inject(NonNullableFormBuilder));
  const type = typeOf(designation);
  form.setValue(criteriaDefaults(type));
  syncCriteriaControls(form, type);
  return form;
}

describe('criteria defaults', () => {
  it("take the idle point from the type's published reference operating point", () => {
    const v = criteriaDefaults(typeOf('EL34'));
    expect([v.idleVaVolts, v.idleVg1Volts, v.vg2Volts]).toEqual([250, -13.5, 250]);
    expect(v.groupSize).toBe(4);
    expect(v.statuses).toEqual(['in-stock']);
    expect(v.tolerancePercent).toBe(5);
    expect([v.iaWeight, v.gmWeight, v.curveWeight]).toEqual([1, 1, 1]);
    expect(criteriaDefaults(typeOf('12AX7')).vg2Volts).toBeNull();
  });

  it('put the drive point at more current than idle, inside the default sweep limits', () => {
    for (const type of VALVE_TYPE_VIEWS.filter((t) => t.model)) {
      const idle = idleDefault(type);
      const drive = driveDefault(type);
      const plan = type.defaultPlan;
      expect(drive.vaVolts).toBeLessThan(idle.vaVolts);
      expect(drive.vg1Volts).toBeLessThanOrEqual(0);
      expect(drive.vg1Volts).toBeGreaterThanOrEqual(idle.vg1Volts);
      const model = type.model!;
      const ia =
        model.kind === 'pentode'
          ? korenPentodeIa(
              model.params as unknown as KorenPentodeParams,
              drive.vaVolts,
              drive.vg1Volts,
              plan.vg2Volts,
            )
          : korenTriodeIa(
              model.params as unknown as KorenTriodeParams,
              drive.vaVolts,
              drive.vg1Volts,
            );
      if (drive.vg1Volts > idle.vg1Volts) {
        expect(ia).toBeLessThanOrEqual(plan.iaMaxMilliamps);
        expect((ia * drive.vaVolts) / 1000).toBeLessThanOrEqual(plan.paMaxWatts);
      }
    }
    expect(driveDefault(typeOf('12AX7'))).toEqual({ vaVolts: 150, vg1Volts: -1 });
  });

  it('put the curve window around the idle point, within the sweep', () => {
    expect(windowDefault(typeOf('EL34'))).toEqual({
      vaMinVolts: 100,
      vaMaxVolts: 250,
      iaMinMilliamps: 10,
      iaMaxMilliamps: 160,
    });
    expect(windowDefault(typeOf('12AX7'))).toEqual({
      vaMinVolts: 100,
      vaMaxVolts: 250,
      iaMinMilliamps: 0.12,
      iaMaxMilliamps: 2.4,
    });
  });
});

describe('criteria form', () => {
  it('is valid with the defaults of every catalogued type', () => {
    for (const type of VALVE_TYPE_VIEWS) {
      expect(formFor(type.designation).valid, type.designation).toBe(true);
    }
  });

  it('asks a screen voltage of a pentode but not of a triode', () => {
    const el34 = formFor('EL34');
    el34.controls.vg2Volts.setValue(null);
    expect(el34.valid).toBe(false);
    const triode = formFor('12AX7');
    expect(triode.controls.vg2Volts.disabled).toBe(true);
    expect(triode.valid).toBe(true);
  });

  it('refuses a positive grid, a zero anode voltage and a tolerance over 100 %', () => {
    const form = formFor('12AX7');
    form.controls.idleVg1Volts.setValue(1);
    expect(form.controls.idleVg1Volts.hasError('max')).toBe(true);
    form.controls.idleVg1Volts.setValue(-2);
    form.controls.idleVaVolts.setValue(0);
    expect(form.controls.idleVaVolts.hasError('min')).toBe(true);
    form.controls.idleVaVolts.setValue(250);
    form.controls.tolerancePercent.setValue(120);
    expect(form.valid).toBe(false);
    form.controls.tolerancePercent.setValue(2.5);
    expect(form.valid).toBe(true);
  });

  it('checks the window only when curves are compared', () => {
    const form = formFor('EL34');
    form.controls.windowVaMaxVolts.setValue(50);
    expect(form.valid).toBe(true);
    form.controls.compareAt.setValue('window');
    syncCriteriaControls(form, typeOf('EL34'));
    expect(form.hasError('windowVa')).toBe(true);
    expect(form.controls.idleVaVolts.disabled).toBe(true);
  });

  it('needs one weight in use above zero', () => {
    const form = formFor('EL34');
    form.controls.iaWeight.setValue(0);
    form.controls.gmWeight.setValue(0);
    expect(form.hasError('noWeight')).toBe(true);
    form.controls.gmWeight.setValue(0.5);
    expect(form.valid).toBe(true);
  });

  it('offers section matching only for double triodes', () => {
    expect(formFor('12AX7').controls.sections.enabled).toBe(true);
    expect(formFor('EL34').controls.sections.disabled).toBe(true);
  });
});

describe('run request', () => {
  it('sends the idle point with its screen voltage and no window by default', () => {
    const body = runRequest(formFor('EL34'));
    expect(body).toEqual({
      valveType: 'EL34',
      groupSize: 4,
      statuses: ['in-stock'],
      tolerancePercent: 5,
      operatingPoints: [{ label: 'idle', vaVolts: 250, vg1Volts: -13.5, vg2Volts: 250 }],
      weights: { ia: 1, gm: 1 },
    });
  });

  it('sends a drive point, a window, the pool filters and section criteria as chosen', () => {
    const form = formFor('12AX7');
    form.patchValue({
      compareAt: 'both',
      useDrive: true,
      minGrade: 'fair',
      sweptSince: '2026-11-01',
      sections: 'both',
      maxImbalancePercent: 8,
      sectionBalanceWeight: 0.5,
      groupSize: 2,
    });
    syncCriteriaControls(form, typeOf('12AX7'));
    const body = runRequest(form);
    expect(body.operatingPoints).toEqual([
      { label: 'idle', vaVolts: 250, vg1Volts: -2 },
      { label: 'drive', vaVolts: 150, vg1Volts: -1 },
    ]);
    expect(body.window).toEqual({
      vaMinVolts: 100,
      vaMaxVolts: 250,
      iaMinMilliamps: 0.12,
      iaMaxMilliamps: 2.4,
    });
    expect(body.weights).toEqual({ ia: 1, gm: 1, curve: 1, sectionBalance: 0.5 });
    expect(body.grades).toEqual(['strong', 'fair']);
    expect(body.dateFrom).toBe(new Date('2026-11-01T00:00:00').toISOString());
    expect(body.sections).toBe('both');
    expect(body.maxSectionImbalancePercent).toBe(8);
    expect(body.groupSize).toBe(2);
  });

  it('compares whole curves only with no operating point', () => {
    const form = formFor('EL34');
    form.controls.compareAt.setValue('window');
    syncCriteriaControls(form, typeOf('EL34'));
    const body = runRequest(form);
    expect(body.operatingPoints).toEqual([]);
    expect(body.weights).toEqual({ curve: 1 });
    expect(body.window?.vaMaxVolts).toBe(250);
  });

  it("restores the form from a run's stored criteria", () => {
    const form = formFor('12AX7');
    form.patchValue({ compareAt: 'both', useDrive: true, minGrade: 'weak', tolerancePercent: 3 });
    form.controls.driveVg1Volts.setValue(-1.5);
    syncCriteriaControls(form, typeOf('12AX7'));
    const restored = criteriaValue(runRequest(form), typeOf('12AX7'));
    expect(restored).toEqual(form.getRawValue());
    const typical = criteriaValue({ valveType: 'EL34', groupSize: 2 }, typeOf('EL34'));
    expect(typical.compareAt).toBe('points');
    expect(typical.idleVg1Volts).toBe(-13.5);
    expect(typical.groupSize).toBe(2);
  });
});
