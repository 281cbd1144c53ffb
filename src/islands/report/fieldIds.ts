/** DOM id of a field's main control, so a 422 can scroll to it and Enter can find the next one. */
export const fieldDomId = (errorKey: string): string => `f-${errorKey.replace(/[^A-Za-z0-9_-]/g, '_')}`;
