import type { z } from 'zod';
import { DEFAULT_GRADE_THRESHOLDS } from '../../shared/grading/grade-thresholds';
import { DEFAULT_QUICK_TEST_THRESHOLDS } from '../../shared/grading/quick-test-thresholds';
import type { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../auth/auth-user';
import type { HubDb } from '../db/database';
import { HttpError } from '../http/http-error';
import { readSettingValues, writeSettingValues } from './settings.repository';
import {
  workshopSettingsSchema,
  type putSettingsBody,
  type WorkshopSettings,
} from './settings.schemas';

/** Settings of a workshop that has changed none. */
export const DEFAULT_SETTINGS: WorkshopSettings = {
  labelPrefix: 'V',
  labelDigits: 4,
  nextLabelNumber: 1,
  gradeThresholds: DEFAULT_GRADE_THRESHOLDS,
  quickTestLimits: {
    reducedHeaterMaxDropPercent: DEFAULT_QUICK_TEST_THRESHOLDS.reducedHeaterMaxDropPercent,
    gasMaxMicroamps: DEFAULT_QUICK_TEST_THRESHOLDS.gasMaxMicroamps,
    leakageMaxMicroamps: DEFAULT_QUICK_TEST_THRESHOLDS.leakageMaxMicroamps,
    electrodeLeakageMaxMicroamps: DEFAULT_QUICK_TEST_THRESHOLDS.electrodeLeakageMaxMicroamps,
    shortMinMicroamps: DEFAULT_QUICK_TEST_THRESHOLDS.shortMinMicroamps,
  },
};

/** The settings in force: stored values over the defaults (a bad stored value is ignored). */
export async function readSettings(db: HubDb): Promise<WorkshopSettings> {
  const stored = await readSettingValues(db);
  const out = { ...DEFAULT_SETTINGS };
  for (const key of Object.keys(DEFAULT_SETTINGS) as (keyof WorkshopSettings)[]) {
    if (!(key in stored)) continue;
    const parsed = workshopSettingsSchema.shape[key].safeParse(stored[key]);
    if (parsed.success) Object.assign(out, { [key]: parsed.data });
  }
  return out;
}

/** A generated label, e.g. KL-0001. */
export function formatLabel(prefix: string, digits: number, n: number): string {
  return `${prefix}-${String(n).padStart(digits, '0')}`;
}

/**
 * Takes the next free generated label and advances the counter past it. Call inside the
 * transaction that inserts the valve, so two valves never get one label.
 */
export async function allocateLabel(
  trx: HubDb,
  isTaken: (label: string) => Promise<boolean>,
): Promise<string> {
  const s = await readSettings(trx);
  let n = s.nextLabelNumber;
  let label = formatLabel(s.labelPrefix, s.labelDigits, n);
  while (await isTaken(label)) label = formatLabel(s.labelPrefix, s.labelDigits, ++n);
  await writeSettingValues(trx, { nextLabelNumber: n + 1 }, null);
  return label;
}

/** Workshop settings: label scheme, grade thresholds and quick-test limits. */
export type SettingsService = ReturnType<typeof createSettingsService>;

/** Builds the settings service. */
export function createSettingsService({ db, audit }: { db: HubDb; audit: AuditService }) {
  return {
    /** The settings in force. */
    get: () => readSettings(db),

    /** Changes some settings (admin); audited with from and to. */
    async update(
      body: z.output<typeof putSettingsBody>,
      user: AuthUser,
    ): Promise<WorkshopSettings> {
      const before = await readSettings(db);
      const given = Object.fromEntries(Object.entries(body).filter(([, v]) => v !== undefined));
      const merged = {
        ...before,
        ...given,
        quickTestLimits: { ...before.quickTestLimits, ...body.quickTestLimits },
      };
      const checked = workshopSettingsSchema.safeParse(merged);
      if (!checked.success) {
        throw new HttpError(400, 'validation_failed', checked.error.issues[0].message);
      }
      // Stored whole (a partial quickTestLimits is merged first), so a read sees it complete.
      const written = Object.fromEntries(
        Object.keys(given).map((k) => [k, merged[k as keyof WorkshopSettings]]),
      );
      await writeSettingValues(db, written, user.id);
      const changes = Object.fromEntries(
        Object.keys(given).map((k) => [
          k,
          { from: before[k as keyof WorkshopSettings], to: merged[k as keyof WorkshopSettings] },
        ]),
      );
      await audit.record(user, 'settings.update', 'settings', { changes });
      return readSettings(db);
    },
  };
}
