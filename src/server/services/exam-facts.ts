import type { Exam, ExamType, Patient, Room } from '../../db/models';
import { formatInstant } from '../../lib/time';
import type { ExamFacts } from '../mail/templates';

/** The facts a patient e-mail needs about an exam, in the clinic's time zone. */
export function examFacts(x: { patient: Patient; type: ExamType; room: Room; exam: Exam }, timeZone: string): ExamFacts {
  return {
    patientName: `${x.patient.givenName} ${x.patient.familyName}`,
    examTypeName: x.type.name,
    accessionNumber: x.exam.accessionNumber,
    when: formatInstant(x.exam.scheduledStart, timeZone),
    room: x.room.name,
    preparation: x.type.preparationText,
  };
}
