import { createHash } from 'node:crypto';
import { Op, UniqueConstraintError } from 'sequelize';
import { db } from '../../db/connection';
import { Exam, Setting } from '../../db/models';
import { canonicalJson } from '../../lib/canonical-json';
import type { UrgentRuleId } from '../../lib/clinical/urgent';
import { clinicProfileSchema, type ClinicProfile } from '../../lib/schemas/clinic';
import {
  clinicHoursSchema,
  DEFAULT_CLINIC_HOURS,
  DEFAULT_PAYMENT_POLICY,
  DEFAULT_REPORT_DELIVERY,
  DEFAULT_URGENT_RULES,
  paymentPolicySchema,
  reportDeliverySchema,
  SETTINGS_GROUP_KEYS,
  URGENT_RULE_IDS,
  urgentRulesSchema,
  type BookedOnClosedDate,
  type CancellationSettingsInput,
  type ClinicHours,
  type ClinicSettingsDto,
  type ClinicSettingsInput,
  type DeliverySettingsInput,
  type HoursSettingsInput,
  type SettingsGroup,
  type SettingState,
  type UrgentRulesSettingsInput,
} from '../../lib/schemas/settings';
import type { SessionUser } from '../../lib/session-user';
import { zonedDate, zonedDayRange } from '../../lib/time';
import { HttpError } from '../http/errors';
import { audit } from './audit';
import { clinicProfile, DEFAULT_CLINIC_PROFILE, forgetSettingsCache } from './settings';

type Value<G extends SettingsGroup> = ClinicSettingsDto[G]['value'];

/** How each group reads its row: the stored schema, the default, and the shape the form edits. */
const GROUPS: { [G in SettingsGroup]: { label: string; read: (stored: unknown) => Value<G> } } = {
  clinic: { label: 'clinic profile', read: (v) => parsedOr(clinicProfileSchema, v, DEFAULT_CLINIC_PROFILE) },
  hours: { label: 'opening hours', read: (v) => parsedOr(clinicHoursSchema, v, DEFAULT_CLINIC_HOURS) },
  cancellations: { label: 'cancellation policy', read: (v) => parsedOr(paymentPolicySchema, v, DEFAULT_PAYMENT_POLICY) },
  delivery: { label: 'report delivery settings', read: (v) => parsedOr(reportDeliverySchema, v, DEFAULT_REPORT_DELIVERY) },
  urgentRules: {
    label: 'urgent-finding prompts',
    // Every known rule, on unless the row says off (ids no longer known are left out).
    read: (v) => {
      const stored = parsedOr<Record<string, boolean>>(urgentRulesSchema, v, {});
      return Object.fromEntries(URGENT_RULE_IDS.map((id) => [id, stored[id] ?? DEFAULT_URGENT_RULES[id]])) as Record<UrgentRuleId, boolean>;
    },
  },
};

function parsedOr<T>(schema: { safeParse(v: unknown): { success: boolean; data?: unknown } }, value: unknown, fallback: T): T {
  const parsed = schema.safeParse(value);
  return parsed.success ? (parsed.data as T) : fallback;
}

/**
 * The version a form sends back: a digest of the stored value, 'default' while there is no row.
 * Not `updated_at`: that column holds whole seconds, and two saves within one second would
 * look alike. Equal content means nothing the form saw was overwritten, so it may save.
 */
function versionOf(stored: unknown | null): string {
  return stored === null ? 'default' : createHash('sha256').update(canonicalJson(stored)).digest('hex').slice(0, 20);
}

function stateOf<G extends SettingsGroup>(group: G, row: Setting | null): SettingState<Value<G>> {
  return { value: GROUPS[group].read(row?.value), version: versionOf(row?.value ?? null), updatedAt: row?.updatedAt?.toISOString() ?? null };
}

/** Every group of the clinic settings form, read in one query (not cached: the form shows what is stored). */
export async function settingsForEditing(): Promise<ClinicSettingsDto> {
  const rows = await Setting.findAll({ where: { key: Object.values(SETTINGS_GROUP_KEYS) } });
  const row = (group: SettingsGroup) => rows.find((r) => r.key === SETTINGS_GROUP_KEYS[group]) ?? null;
  return {
    clinic: stateOf('clinic', row('clinic')),
    hours: stateOf('hours', row('hours')),
    cancellations: stateOf('cancellations', row('cancellations')),
    delivery: stateOf('delivery', row('delivery')),
    urgentRules: stateOf('urgentRules', row('urgentRules')),
  };
}

/** The time zones the form offers (this runtime's IANA list), with the saved one kept if the list lacks it. */
export function timeZoneChoices(current: string): string[] {
  const zones = new Set(Intl.supportedValuesOf('timeZone'));
  zones.add('UTC');
  zones.add(current);
  return [...zones].sort();
}

/** A changed field: old and new value, or for closed dates the days added and removed. */
type Change = { from: unknown; to: unknown } | { added: string[]; removed: string[] };

/**
 * The fields a save changes, by path ('timeZone', 'weekly.1', 'closedDates', 'lvef-severe').
 * Settings hold no patient data, so old and new values go into the audit trail.
 */
export function settingChanges(before: unknown, after: unknown, path = '', out: Record<string, Change> = {}): Record<string, Change> {
  const isObject = (v: unknown): v is Record<string, unknown> => v !== null && typeof v === 'object' && !Array.isArray(v);
  if (isObject(before) && isObject(after)) {
    for (const key of new Set([...Object.keys(before), ...Object.keys(after)])) settingChanges(before[key], after[key], path ? `${path}.${key}` : key, out);
    return out;
  }
  if (canonicalJson(before) === canonicalJson(after)) return out;
  if (path === 'weekly' && Array.isArray(before) && Array.isArray(after)) {
    after.forEach((day, i) => settingChanges(before[i], day, `weekly.${i}`, out));
    return out;
  }
  if (path === 'closedDates' && Array.isArray(before) && Array.isArray(after)) {
    out[path] = { added: after.filter((d) => !before.includes(d)), removed: before.filter((d) => !after.includes(d)) };
    return out;
  }
  out[path || 'value'] = { from: before ?? null, to: after ?? null };
  return out;
}

/**
 * Saves one group: the row locked, the version the form saw checked (409 when someone saved
 * meanwhile), the value written with one audit event naming the key and the changed fields,
 * all in one transaction; then this process forgets its cached settings. Other processes (the
 * worker, the DICOM listener) read the new value when their 30-second cache runs out.
 * A save that changes nothing writes and records nothing.
 */
async function saveGroup<G extends SettingsGroup>(
  actor: SessionUser,
  group: G,
  version: string,
  next: (current: Value<G>) => Value<G>,
  requestId: string,
): Promise<{ setting: SettingState<Value<G>>; before: Value<G> }> {
  const key = SETTINGS_GROUP_KEYS[group];
  const { label } = GROUPS[group];
  try {
    const result = await db().transaction(async (transaction) => {
      const row = await Setting.findByPk(key, { transaction, lock: transaction.LOCK.UPDATE });
      const current = stateOf(group, row);
      if (current.version !== version) {
        throw new HttpError(409, 'STALE', `Someone else saved the ${label} after you opened this page. Load the saved version, then make your change again.`, undefined, { current });
      }
      const value = next(current.value);
      const changes = settingChanges(current.value, value);
      if (Object.keys(changes).length === 0) return { setting: current, before: current.value };
      const now = new Date();
      if (row) await Setting.update({ value, updatedAt: now }, { where: { key }, transaction });
      else await Setting.create({ key, value, updatedAt: now }, { transaction });
      await audit({ actorUserId: actor.id, action: 'settings.change', entityType: 'setting', entityId: key, detail: { keys: [key], fields: Object.keys(changes), changes }, requestId }, transaction);
      return { setting: { value, version: versionOf(value), updatedAt: now.toISOString() }, before: current.value };
    });
    forgetSettingsCache();
    return result;
  } catch (error) {
    // Two first saves of a setting that had no row: the second insert finds the first one's.
    if (error instanceof UniqueConstraintError) throw new HttpError(409, 'STALE', `Someone else saved the ${label} at the same moment. Load the saved version, then make your change again.`);
    throw error;
  }
}

/** The clinic profile: name, address, contact and time zone (the currency stays as it is). */
export async function saveClinicSettings(actor: SessionUser, input: ClinicSettingsInput, requestId: string): Promise<{ setting: SettingState<ClinicProfile> }> {
  const { version, ...profile } = input;
  const { setting } = await saveGroup(actor, 'clinic', version, (current) => ({
    ...current,
    ...profile,
    addressLines: profile.addressLines.filter((line) => line !== ''),
  }), requestId);
  return { setting };
}

/**
 * Opening hours and closed dates. Booked exams never move: the answer counts those booked on
 * dates this save closed, so the manager can call the patients.
 */
export async function saveHoursSettings(
  actor: SessionUser,
  input: HoursSettingsInput,
  requestId: string,
): Promise<{ setting: SettingState<ClinicHours>; bookedOnClosedDates: BookedOnClosedDate[] }> {
  const { setting, before } = await saveGroup(actor, 'hours', input.version, () => ({
    weekly: input.weekly.map((day) => [...day].sort((a, b) => (a.open < b.open ? -1 : 1))),
    closedDates: [...input.closedDates].sort(),
  }), requestId);
  const added = setting.value.closedDates.filter((d) => !before.closedDates.includes(d));
  return { setting, bookedOnClosedDates: await bookedOn(added) };
}

/** How many exams are still booked on each of these clinic days (days with none are left out). */
async function bookedOn(days: string[]): Promise<BookedOnClosedDate[]> {
  if (days.length === 0) return [];
  const { timeZone } = await clinicProfile();
  const ranges = days.map((d) => zonedDayRange(d, timeZone));
  const exams = await Exam.findAll({
    attributes: ['scheduledStart'],
    where: { status: 'booked', [Op.or]: ranges.map((r) => ({ scheduledStart: { [Op.gte]: r.start, [Op.lt]: r.end } })) },
  });
  const counts = new Map<string, number>();
  for (const e of exams) {
    const day = zonedDate(e.scheduledStart, timeZone);
    counts.set(day, (counts.get(day) ?? 0) + 1);
  }
  return days.filter((d) => counts.has(d)).map((date) => ({ date, exams: counts.get(date)! }));
}

/** The full-refund window for cancellations (applies to cancellations from now on). */
export async function saveCancellationSettings(actor: SessionUser, input: CancellationSettingsInput, requestId: string) {
  const { setting } = await saveGroup(actor, 'cancellations', input.version, () => ({ fullRefundHoursAhead: input.fullRefundHoursAhead }), requestId);
  return { setting };
}

/** Report links to referrers: lifetime of new links and whether the PDF is attached. */
export async function saveDeliverySettings(actor: SessionUser, input: DeliverySettingsInput, requestId: string) {
  const { setting } = await saveGroup(actor, 'delivery', input.version, () => ({ linkDays: input.linkDays, attachPdf: input.attachPdf }), requestId);
  return { setting };
}

/** Urgent-finding prompts on or off per rule (reports evaluated from now on; see reports.ts). */
export async function saveUrgentRuleSettings(actor: SessionUser, input: UrgentRulesSettingsInput, requestId: string) {
  const { setting } = await saveGroup(actor, 'urgentRules', input.version, () => ({ ...DEFAULT_URGENT_RULES, ...input.rules }), requestId);
  return { setting };
}
