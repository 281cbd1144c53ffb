import { zodResolver } from '@hookform/resolvers/zod';
import { URGENT_RULES, type UrgentRuleId } from '../../lib/clinical/urgent';
import { URGENT_RULE_IDS, urgentRulesSettingsSchema, type SettingState, type UrgentRulesSettingsInput } from '../../lib/schemas/settings';
import { SectionCard } from './SectionCard';
import { Switch } from './Switch';
import { useSettingForm } from './useSettingSave';

type Rules = Record<UrgentRuleId, boolean>;
const WITHIN = { 1: 'within minutes', 2: 'within hours', 3: 'within days' } as const;
const toForm = (s: SettingState<Rules>): UrgentRulesSettingsInput => ({ rules: { ...s.value }, version: s.version });

/** One switch per urgent-finding rule of the clinical engine, with its name and source. */
export function UrgentRulesSection({ initial, timeZone }: { initial: SettingState<Rules>; timeZone: string }) {
  const { form, card } = useSettingForm<Rules, UrgentRulesSettingsInput>({
    path: 'urgent-rules',
    group: 'urgentRules',
    initial,
    resolver: zodResolver(urgentRulesSettingsSchema),
    toForm,
    failMessage: 'The urgent-finding prompts could not be saved.',
    done: (answer) => {
      const off = URGENT_RULE_IDS.filter((id) => !answer.setting.value[id]).length;
      return off === 0 ? 'Saved: every rule prompts.' : `Saved: ${off} rule${off === 1 ? '' : 's'} switched off.`;
    },
  });
  const { register, formState: { errors } } = form;

  return (
    <SectionCard
      {...card}
      id="settings-urgent"
      title="Urgent-finding prompts"
      description={
        <>
          <p>While a report is read, a rule that matches suggests to the physician that the finding may need to be told to a clinician directly. The physician decides and records the call; a prompt is only a reminder.</p>
          <p>A rule switched off stops prompting on reports worked on from now on and on reports still waiting to be read. Signed reports keep what they showed, and the measurements are still flagged as before.</p>
        </>
      }
      timeZone={timeZone}
      submitLabel="Save urgent-finding prompts"
    >
      <ul className="divide-y divide-ink-50">
        {URGENT_RULE_IDS.map((id) => {
          const rule = URGENT_RULES[id];
          return (
            <li key={id} className="py-3">
              <Switch id={`urgent-${id}`} label={rule.description} hint={`Communicate ${WITHIN[rule.category]} (category ${rule.category}). Source: ${rule.source}.`} {...register(`rules.${id}`)} />
              {errors.rules?.[id] && <p className="field-error" role="alert">{errors.rules[id]?.message}</p>}
            </li>
          );
        })}
      </ul>
    </SectionCard>
  );
}
