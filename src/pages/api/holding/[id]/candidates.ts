import { candidateQuerySchema } from '../../../../lib/schemas/holding';
import { idParamsSchema } from '../../../../lib/schemas/users';
import { endpoint } from '../../../../server/http/endpoint';
import { candidatesByAccession } from '../../../../server/services/holding';

/** The exam with a typed accession number, offered for one held object (`?accession=A2612020007`). */
export const GET = endpoint({ roles: ['frontdesk', 'admin'], params: idParamsSchema, query: candidateQuerySchema }, async ({ params, query }) => ({
  candidates: await candidatesByAccession(params.id, query.accession),
}));
