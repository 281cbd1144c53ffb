import { endpoint } from '../../../server/http/endpoint';
import { listHeld } from '../../../server/services/holding';

/** DICOM objects a scanner sent that matched no exam, newest first, each with likely exams. */
export const GET = endpoint({ roles: ['frontdesk', 'admin', 'sonographer'] }, async () => listHeld());
