import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { ApiError } from '../../lib/api-client';
import { saveRow, type CatalogList, type CatalogRows } from './queries';

/**
 * Saves a catalog form: POST for a new row, PUT with the opened version for an edit. A refusal
 * lands on the form: field errors on their fields and the server's message at the top (a clash
 * names the other row; a stale edit keeps the typed values so nothing is lost).
 */
export function useSaveRow<L extends CatalogList, F extends FieldValues>(list: L, existing: { id: number; version: number } | undefined, setError: UseFormSetError<F>) {
  const client = useQueryClient();
  const save = useMutation({
    mutationFn: (body: object) => saveRow(list, body, existing),
    onSettled: () => void client.invalidateQueries({ queryKey: ['catalog'] }),
  });
  const submit = async (body: object, onSaved: (row: CatalogRows[L]) => void) => {
    try {
      onSaved((await save.mutateAsync(body)).row);
    } catch (error) {
      if (!(error instanceof ApiError)) {
        setError('root', { message: 'The change could not be saved. Nothing was changed.' });
        return;
      }
      Object.entries(error.fields).forEach(([field, message], i) => setError(field as Path<F>, { message }, { shouldFocus: i === 0 }));
      setError('root', {
        message: error.code === 'STALE' ? `${error.message} Your changes are still in the form; cancel and open it again to see theirs.` : error.message,
      });
    }
  };
  return { submit, saving: save.isPending };
}
