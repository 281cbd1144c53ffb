import { COMMUNICATION_METHOD_LABELS, type CommunicationDto } from '../schemas/reports';
import { formatInstant } from '../time';

/**
 * The sentence a report carries for an urgent finding told directly to a clinician, e.g.
 * "Urgent finding communicated: abdominal aortic aneurysm 5.6 cm. Told to Dr Ayla Green
 * (referring physician) by telephone on Wed, 2 Dec 2026 at 10:14 by Dr Ansel Okonkwo; the
 * finding was read back." The same words on the report page and in the PDF.
 */
export function communicationStatement(c: Pick<CommunicationDto, 'finding' | 'recipientName' | 'recipientRole' | 'method' | 'communicatedAt' | 'readBack' | 'recordedBy'>, timeZone: string): string {
  const finding = c.finding.trim().replace(/[.\s]+$/, '');
  const who = c.recipientRole ? `${c.recipientName} (${c.recipientRole})` : c.recipientName;
  const readBack = c.readBack ? 'the finding was read back' : 'the finding was not read back';
  return `Urgent finding communicated: ${finding}. Told to ${who} ${COMMUNICATION_METHOD_LABELS[c.method]} on ${formatInstant(new Date(c.communicatedAt), timeZone)} by ${c.recordedBy}; ${readBack}.`;
}
