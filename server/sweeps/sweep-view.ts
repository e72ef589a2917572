import type { SweepPlan } from '../../shared/domain/sweep';
import type { SweepView } from '../../shared/hub/messages';
import type { SweepRecord } from './sweep.repository';

/** Maps a sweep row (snake_case) to the API shape (camelCase). */
export function toSweepView(row: SweepRecord): SweepView {
  return {
    id: row.id,
    benchId: row.bench_id,
    valveType: row.valve_type,
    valveLabel: row.valve_label,
    plan: JSON.parse(row.plan_json) as SweepPlan,
    status: row.status,
    endMessage: row.end_message,
    pointCount: row.point_count,
    deviceCount: row.reported_count,
    operator: row.operator,
    createdAt: row.created_at,
    startedAt: row.started_at,
    endedAt: row.ended_at,
    valveId: row.valve_id,
  };
}
