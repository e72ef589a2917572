import { DEFAULT_QUICK_TEST_THRESHOLDS } from '../../shared/grading/quick-test-thresholds';
import type { HubDb } from '../db/database';
import { readSettings } from '../settings/settings.service';
import { findTypeRecordById } from '../valve-types/valve-type.repository';
import { findValveTypeView } from '../valve-types/valve-type.service';
import { limitsOfType, toValveTypeView } from '../valve-types/valve-type-view';
import { findValveRow } from '../valves/valve.repository';
import type { QuickTestServiceProps } from './quick-test.service';

/**
 * The quick-test service's look-ups in the hub's database: types and their ratings from the
 * type library (so an admin's edit of a rating applies to quick tests as to sweeps), valve
 * records, and the workshop's grade thresholds and hard-fail limits over the defaults.
 */
export function quickTestLookups(
  db: HubDb,
): Required<Pick<QuickTestServiceProps, 'findType' | 'findValve' | 'thresholds'>> {
  return {
    async findType(name) {
      const view = await findValveTypeView(db, name);
      return view && { data: view, limits: limitsOfType(view) };
    },
    async findValve(id) {
      const row = await findValveRow(db, id);
      if (!row) return undefined;
      const type = await findTypeRecordById(db, row.valve_type_id);
      return {
        id: row.id,
        label: row.label,
        valveType: type ? toValveTypeView(type).designation : '',
      };
    },
    async thresholds() {
      const settings = await readSettings(db);
      return {
        ...DEFAULT_QUICK_TEST_THRESHOLDS,
        ...settings.quickTestLimits,
        ...settings.gradeThresholds,
      };
    },
  };
}
