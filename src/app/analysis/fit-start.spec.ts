import { idealTriodeFamily } from '../../testing/analysis-probes';
import { VALVE_TYPE_VIEWS } from '../../testing/fixtures';
import { fitsAsPentode, fitStart } from './fit-start';

const type = (designation: string) => VALVE_TYPE_VIEWS.find((t) => t.designation === designation)!;

describe('fitStart', () => {
  it('starts from the type published Koren set, naming it', () => {
    const start = fitStart(type('12AX7'), idealTriodeFamily());
    expect(start.model).toEqual({ kind: 'triode', params: type('12AX7').model!.params });
    expect(start.source).toBe('the published 12AX7 set (Koren, Glass Audio 8(5), 1996)');
  });

  it('takes MU from the data sheet for a type without a published set', () => {
    const start = fitStart(type('6SN7GT'), idealTriodeFamily());
    expect(start.model.kind).toBe('triode');
    expect(start.model.params.mu).toBe(20);
    expect(start.source).toContain('MU 20 from the data sheet');
  });

  it('takes MU from the curves for an unknown type (the ideal family has mu 100)', () => {
    const start = fitStart(null, idealTriodeFamily());
    expect(start.model.params.mu).toBeCloseTo(100, 3);
    expect(start.source).toContain('from these curves');
  });

  it('fits pentodes and beam tetrodes with the pentode model', () => {
    expect(fitsAsPentode(type('EL34'), 0)).toBe(true);
    expect(fitsAsPentode(type('12AX7'), 250)).toBe(false);
    expect(fitsAsPentode(null, 250)).toBe(true);
    expect(fitStart(type('EL34'), idealTriodeFamily()).model.kind).toBe('pentode');
  });
});
