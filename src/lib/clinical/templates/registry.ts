import type { TemplateId } from '../types';
import { ABDOMEN_TEMPLATE } from './abdomen';
import { ECHO_TEMPLATE } from './echo';
import { THYROID_TEMPLATE } from './thyroid';
import type { TemplateDef } from './types';

export const TEMPLATES: Readonly<Record<TemplateId, TemplateDef>> = {
  thyroid: THYROID_TEMPLATE,
  abdomen: ABDOMEN_TEMPLATE,
  echo: ECHO_TEMPLATE,
};

/** Template by id, e.g. `getTemplate('echo')?.version`; unknown ids give undefined. */
export function getTemplate(id: string): TemplateDef | undefined {
  return Object.hasOwn(TEMPLATES, id) ? TEMPLATES[id as TemplateId] : undefined;
}
