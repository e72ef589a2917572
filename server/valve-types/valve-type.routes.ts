import type { Router } from 'express';
import { HttpError } from '../http/http-error';
import type { ApiMount } from '../route-table';
import { readCsvUpload } from '../uploads/upload-body';
import { parseNominalCurveCsv } from './nominal-curve-csv';
import type { ValveTypeService } from './valve-type.service';

/** Largest nominal-curve file, bytes (1 MiB: a digitised family is a few hundred lines). */
export const MAX_NOMINAL_CSV_BYTES = 1024 * 1024;

/** The curves of an uploaded file, or a 400 naming the line and the reason. */
function parseOrRefuse(text: string) {
  const parsed = parseNominalCurveCsv(text);
  if (!parsed.ok) {
    throw new HttpError(400, 'bad_csv', `line ${parsed.line}: ${parsed.reason}`, {
      file: `line ${parsed.line}: ${parsed.reason}`,
    });
  }
  return parsed;
}

/** /api/valve-types and its sub-routes. */
export function registerValveTypeRoutes(
  router: Router,
  mount: ApiMount,
  types: ValveTypeService,
): void {
  mount(router, 'GET /api/valve-types', () => types.list());
  mount(router, 'POST /api/valve-types', ({ body, user }) => types.create(body, user));
  mount(router, 'GET /api/valve-types/:designation', ({ params }) => types.get(params.designation));
  mount(router, 'PATCH /api/valve-types/:designation', ({ params, body, user }) =>
    types.update(params.designation, body, user),
  );
  mount(router, 'DELETE /api/valve-types/:designation', async ({ params, user }, res) => {
    await types.remove(params.designation, user);
    res.status(204).end();
  });
  mount(router, 'GET /api/valve-types/:designation/nominal-curves', ({ params }) =>
    types.nominalCurves(params.designation),
  );
  mount(
    router,
    'POST /api/valve-types/:designation/nominal-curves/preview',
    async ({ params }, res, req) => {
      await types.get(params.designation);
      const { text } = await readCsvUpload(req, res, 'file', MAX_NOMINAL_CSV_BYTES);
      const { curves, pointCount, hasScreenCurrent } = parseOrRefuse(text);
      return {
        curves: curves.map((c) => ({
          vg1Volts: c.vg1Volts,
          pointCount: c.points.length,
          vaMinVolts: c.points[0].vaVolts,
          vaMaxVolts: c.points[c.points.length - 1].vaVolts,
        })),
        pointCount,
        hasScreenCurrent,
      };
    },
  );
  mount(
    router,
    'POST /api/valve-types/:designation/nominal-curves',
    async ({ params, query, user }, res, req) => {
      await types.get(params.designation);
      const { text, fields } = await readCsvUpload(req, res, 'file', MAX_NOMINAL_CSV_BYTES);
      const source = (fields.source ?? query.source ?? '').trim();
      if (!source || source.length > 200) {
        throw new HttpError(400, 'validation_failed', 'say where the curves come from', {
          source: 'a source of 1 to 200 characters is needed',
        });
      }
      const { curves } = parseOrRefuse(text);
      return types.saveNominalCurves(params.designation, curves, source, user);
    },
  );
}
