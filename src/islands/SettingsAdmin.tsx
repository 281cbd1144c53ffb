import type { ClinicSettingsDto } from '../lib/schemas/settings';
import { CancellationSection } from './settings/CancellationSection';
import { ClinicSection } from './settings/ClinicSection';
import { DeliverySection } from './settings/DeliverySection';
import { HoursSection } from './settings/HoursSection';
import { UrgentRulesSection } from './settings/UrgentRulesSection';

interface Props {
  /** Every group as stored, each with the version its save sends back. */
  initial: ClinicSettingsDto;
  /** IANA time zones offered (the server's list, so server and browser render the same options). */
  timeZones: string[];
  /** The clinic's today (YYYY-MM-DD), to mark closed dates already past. */
  today: string;
}

/**
 * The clinic manager's settings: each section is its own form with its own save, checked against
 * the version it loaded, so two managers never overwrite each other unnoticed.
 */
export default function SettingsAdmin({ initial, timeZones, today }: Props) {
  const timeZone = initial.clinic.value.timeZone;
  return (
    <div className="space-y-6">
      <p className="rounded-md bg-crest-50 px-4 py-3 text-sm text-crest-800 ring-1 ring-crest-100">
        Each section saves on its own, and every change is written to the audit trail with the old and new values. Screens of Crestline use a change at once; the background worker (reminders, report e-mails) and the scanner listener pick it up within 30 seconds. A change never rewrites what has happened: booked exams, sent links, refunds made and signed reports stay as they are.
      </p>
      <ClinicSection initial={initial.clinic} timeZones={timeZones} timeZone={timeZone} />
      <HoursSection initial={initial.hours} timeZone={timeZone} today={today} />
      <CancellationSection initial={initial.cancellations} timeZone={timeZone} />
      <DeliverySection initial={initial.delivery} timeZone={timeZone} />
      <UrgentRulesSection initial={initial.urgentRules} timeZone={timeZone} />
    </div>
  );
}
