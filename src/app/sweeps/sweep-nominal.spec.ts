import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { firstValueFrom } from 'rxjs';
import { korenTriodeIa, type KorenTriodeParams } from '../../../shared/physics/koren';
import { pointsOf, SMALL_PLAN, VALVE_TYPE_VIEWS } from '../../testing/fixtures';
import { TypesApi, type NominalCurves, type TypeView } from '../types/types-api';
import {
  loadNominalSource,
  nominalDrawing,
  nominalOverlays,
  referenceComparison,
} from './sweep-nominal';

const AX7 = VALVE_TYPE_VIEWS.find((t) => t.designation === '12AX7')!;
const TYPES = [
  { ...AX7, hasNominalCurves: false, hasModel: true, hasScreen: false },
] as unknown as TypeView[];

const NONE: NominalCurves = {
  designation: '12AX7',
  source: null,
  uploadedBy: null,
  uploadedAt: null,
  curves: [],
};

const UPLOADED: NominalCurves = {
  designation: '12AX7',
  source: 'Workshop bench notes 2024',
  uploadedBy: 'admin',
  uploadedAt: '2026-01-01T00:00:00Z',
  curves: [0, -2].map((vg1Volts) => ({
    vg1Volts,
    points: [
      { vaVolts: 200, iaMilliamps: 2 + vg1Volts, ig2Milliamps: null },
      { vaVolts: 0, iaMilliamps: 0, ig2Milliamps: null },
      { vaVolts: 300, iaMilliamps: 3 + vg1Volts, ig2Milliamps: null },
    ],
  })),
};

describe('sweep nominal curves', () => {
  let http: HttpTestingController;
  let api: TypesApi;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideHttpClient(), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpTestingController);
    api = TestBed.inject(TypesApi);
  });

  afterEach(() => http.verify());

  /** Loads the type of a sweep taken as `designation`, answering the library with `stored`. */
  async function load(designation: string, stored: NominalCurves) {
    const source = firstValueFrom(loadNominalSource(api, designation));
    http.expectOne('/api/valve-types').flush(TYPES);
    http.expectOne('/api/valve-types/12AX7/nominal-curves').flush(stored);
    return (await source)!;
  }

  it('draws the published model at each measured Vg1 when no curves are uploaded', async () => {
    // Curves 0 and 2 of three were measured, from 50 V to 200 V.
    const points = pointsOf(SMALL_PLAN, 5).filter((p) => p.curve !== 1 && p.vaVolts >= 50);
    const source = await load('ecc83', NONE);
    const drawing = nominalDrawing(source.type, source.stored, SMALL_PLAN, points)!;
    expect(drawing.from).toBe('model');
    expect(drawing.legendName).toBe('Published model (Koren 1996)');
    expect(drawing.lines.map((l) => l.vg1Volts)).toEqual([0, -2]);
    const line = drawing.lines[1];
    expect(line.data[0][0]).toBe(50);
    expect(line.data.at(-1)![0]).toBe(200);
    const params = AX7.model!.params as KorenTriodeParams;
    expect(line.data.at(-1)![1]).toBeCloseTo(korenTriodeIa(params, 200, -2), 9);
    const overlays = nominalOverlays(drawing, false);
    expect(overlays.map((o) => o.id)).toEqual(['nominal-0', 'nominal--2']);
    expect(overlays.every((o) => o['name'] === 'Published model (Koren 1996)')).toBe(true);
    expect((overlays[0]['lineStyle'] as { type: unknown }).type).not.toBe('solid');
  });

  it('uses the uploaded curves, sorted by Va, when the type has them', async () => {
    const points = pointsOf(SMALL_PLAN, 4);
    const source = await load('12AX7', UPLOADED);
    const drawing = nominalDrawing(source.type, source.stored, SMALL_PLAN, points)!;
    expect(drawing.from).toBe('uploaded');
    expect(drawing.legendName).toBe('Nominal (Workshop bench notes 2024)');
    expect(drawing.lines).toEqual([
      {
        vg1Volts: 0,
        data: [
          [0, 0],
          [200, 2],
          [300, 3],
        ],
      },
      {
        vg1Volts: -2,
        data: [
          [0, 0],
          [200, 0],
          [300, 1],
        ],
      },
    ]);
    // The reference point (250 V, -2 V) lies on the uploaded -2 V curve, halfway between.
    const ref = referenceComparison(drawing, SMALL_PLAN, points)!;
    expect(ref.vaVolts).toBe(250);
    expect(ref.nominalMilliamps).toBeCloseTo(0.5, 9);
    // The sweep stops at 200 V: no measured Ia at 250 V.
    expect(ref.measuredMilliamps).toBeNull();
  });

  it('draws nothing for a type the library does not know', async () => {
    const source = firstValueFrom(loadNominalSource(api, '6XYZ9'));
    http.expectOne('/api/valve-types').flush(TYPES);
    expect(await source).toBeNull();
  });
});
