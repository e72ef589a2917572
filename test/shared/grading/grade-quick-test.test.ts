import { describe, expect, it } from 'vitest';
import { gradeQuickTest } from '../../../shared/grading/grade-quick-test';
import type { QuickTestReference } from '../../../shared/grading/quick-test-plan';
import type {
  GmMeasurement,
  PartOutcome,
  PartResult,
} from '../../../shared/grading/quick-test-results';
import {
  DEFAULT_QUICK_TEST_THRESHOLDS,
  type QuickTestThresholds,
} from '../../../shared/grading/quick-test-thresholds';

/*
 * Thresholds named here, with where they come from:
 * - strong from 80 %, fair from 65 % of nominal: common practice (a valve below about 60-70 % of
 *   nominal gm or emission is usually replaced);
 * - reduced-heater drop up to 10 %: common practice (a sound cathode's gm hardly moves at 10 %
 *   less heater, a worn one falls sharply);
 * - gas 0.2 uA, leakage 10 uA heater-cathode and 2 uA elsewhere, short from 100 uA: our choices.
 */
const T: QuickTestThresholds = DEFAULT_QUICK_TEST_THRESHOLDS;

/** 12AX7, RCA data sheet operating point (reference sheet, section 3): 250 V, -2 V, 1.2 mA, 1600 uS. */
const REF: QuickTestReference = {
  valveType: '12AX7',
  vaVolts: 250,
  vg2Volts: 0,
  vg1Volts: -2,
  heaterVolts: 12.6,
  reducedHeaterVolts: 11.34,
  iaMilliamps: 1.2,
  gmMicrosiemens: 1600,
  source: 'RCA data sheet; high',
  emissionVolts: 10,
  expectedEmissionMilliamps: 18.46,
};

function gmAt(gmMicrosiemens: number, heaterVolts = 12.6): GmMeasurement {
  return {
    vaVolts: 250,
    vg2Volts: 0,
    vg1Volts: -2,
    heaterVolts,
    gridStepVolts: 0.1,
    iaMilliamps: 1,
    gmMicrosiemens,
    method: 'central',
  };
}

function done(result: PartResult): PartOutcome {
  return { part: result.part, status: 'done', message: null, errorCode: null, result };
}

/** A sound valve's parts, with changes. */
function parts(
  o: { gm?: number; emission?: number; ig1?: number; hk?: number; ak?: number; drop?: number } = {},
) {
  const gm = o.gm ?? 1600;
  return [
    done({
      part: 'leakage',
      pairs: [
        { pair: 'heater-cathode', volts: 100, microamps: o.hk ?? 0.06, overRange: false },
        { pair: 'grid1-cathode', volts: 100, microamps: 0.02, overRange: false },
        {
          pair: 'anode-cathode',
          volts: 100,
          microamps: Math.min(o.ak ?? 0.03, 500),
          overRange: (o.ak ?? 0) > 500,
        },
      ],
    }),
    done({
      part: 'gm',
      measurement: gmAt(gm),
      nominalGmMicrosiemens: 1600,
      gmPercent: Math.round((gm / 16) * 10) / 10,
      nominalIaMilliamps: 1.2,
      iaPercent: 83.3,
    }),
    done({
      part: 'grid-current',
      vaVolts: 250,
      vg1Volts: -2,
      vg2Volts: 0,
      iaMilliamps: 1,
      ig1Microamps: o.ig1 ?? -0.002,
      gridKiloohms: 47,
    }),
    done({
      part: 'emission',
      vaVolts: 10,
      milliamps: ((o.emission ?? 98) / 100) * 18.46,
      overRange: false,
      expectedMilliamps: 18.46,
      percent: o.emission ?? 98,
    }),
    done({
      part: 'reduced-heater',
      nominal: gmAt(gm),
      reduced: gmAt(gm * (1 - (o.drop ?? 0.8) / 100), 11.34),
      dropPercent: o.drop ?? 0.8,
    }),
  ];
}

describe('gradeQuickTest', () => {
  it('grades a valve at nominal strong, with the lower of gm and emission as the reason', () => {
    const g = gradeQuickTest(REF, parts({ gm: 1664, emission: 97 }), T);
    expect(g.grade).toBe('strong');
    expect(g.reason).toBe(
      "emission 97 % of a sound valve's (17.9 of 18.5 mA) at 10 V, grids strapped to the anode",
    );
    expect(g.findings.map((f) => f.verdict)).toEqual([
      'strong',
      'strong',
      'pass',
      'info',
      'pass',
      'pass',
    ]);
  });

  it('grades by % of nominal gm: 64 % is weak, 70 % fair, 80 % strong (strong from 80 %, fair from 65 %: common practice)', () => {
    const g = gradeQuickTest(REF, parts({ gm: 1024 }), T);
    expect(g.grade).toBe('weak');
    expect(g.reason).toBe('gm 64 % of nominal (1020 of 1600 uS) at 250 V / -2 V');
    expect(gradeQuickTest(REF, parts({ gm: 1120 }), T).grade).toBe('fair');
    expect(gradeQuickTest(REF, parts({ gm: 1280 }), T).grade).toBe('strong');
  });

  it("follows the workshop's own thresholds", () => {
    const lenient = { ...T, strongMinPercent: 70, fairMinPercent: 50 };
    expect(gradeQuickTest(REF, parts({ gm: 1120 }), lenient).grade).toBe('strong');
    expect(gradeQuickTest(REF, parts({ ig1: -0.3 }), { ...T, gasMaxMicroamps: 0.5 }).grade).toBe(
      'strong',
    );
  });

  it('fails a valve with reverse grid current above 0.2 uA as gassy, whatever its gm', () => {
    const g = gradeQuickTest(REF, parts({ ig1: -0.47 }), T);
    expect(g.grade).toBe('gassy');
    expect(g.reason).toBe(
      'reverse grid current 0.47 uA at 250 V / -2 V through 47 kOhm (limit 0.2 uA): gas',
    );
  });

  it('fails a gm fall above 10 % at reduced heater as a worn cathode (common practice)', () => {
    const g = gradeQuickTest(REF, parts({ drop: 46.6 }), T);
    expect(g.grade).toBe('worn-cathode');
    expect(g.reason).toMatch(/^gm falls 46.6 % at 11.34 V heater \(10 % below 12.6 V\)/);
    expect(gradeQuickTest(REF, parts({ drop: 3 }), T).grade).toBe('strong');
  });

  it('fails a short and a leak between the right electrodes, the short first', () => {
    const short = gradeQuickTest(REF, parts({ ak: 1000 }), T);
    expect(short.grade).toBe('short');
    expect(short.reason).toBe(
      "anode-cathode short: beyond the meter's 500 uA at 100 V (a short is 100 uA or more)",
    );
    const leaky = gradeQuickTest(REF, parts({ hk: 47.6 }), T);
    expect(leaky.grade).toBe('leaky');
    expect(leaky.reason).toBe('heater-cathode leakage 47.6 uA at 100 V (limit 10 uA)');
    const both = gradeQuickTest(REF, parts({ hk: 47.6, ig1: -1, ak: 1000 }), T);
    expect(both.findings.slice(0, 3).map((f) => f.verdict)).toEqual(['short', 'leaky', 'gassy']);
  });

  it('fails an open heater from the tracer error, and says incomplete when nothing graded was read', () => {
    const open: PartOutcome[] = [
      {
        part: 'leakage',
        status: 'failed',
        message: 'E30 heater open',
        errorCode: 'E30',
        result: null,
      },
      { part: 'gm', status: 'skipped', message: 'not run: fault', errorCode: null, result: null },
    ];
    const g = gradeQuickTest(REF, open, T);
    expect(g.grade).toBe('open-heater');
    expect(g.reason).toBe('no heater current at 12.6 V (tracer error E30): the heater is open');
    const nothing = gradeQuickTest(REF, [open[1]], T);
    expect(nothing.grade).toBe('incomplete');
    expect(nothing.reason).toBe('no gm or emission reading (gm: not run: fault)');
  });
});
