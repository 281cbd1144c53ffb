import { useEffect, useMemo, useReducer, useRef, useState } from 'react';
import { CAUTIONS, formatQuantity, getTemplate, missingRequired, PROBE_KINDS, type DerivedValue, type Flag, type NoduleAssessment, type NumberField } from '../lib/clinical';
import { differences } from '../lib/report-form/conflict';
import { draftBody, evaluateLive, measurementKey, toFormErrorKeys } from '../lib/report-form/entries';
import { answerValue, listen, PUT_VALUE_EVENT, type PutValueDetail } from '../lib/report-form/external-values';
import { formFromStored, numberText } from '../lib/report-form/form-state';
import type { MeasurementSource } from '../lib/schemas/reports';
import { PATIENT_SECTION } from '../lib/report-form/placement';
import { formReducer } from '../lib/report-form/reducer';
import { fieldNames, waivedFields } from '../lib/report-form/template-info';
import type { FormContext, FormReport } from '../lib/report-form/types';
import type { FieldActions } from './report/actions';
import { Assessments } from './report/Assessments';
import { ConflictNotice } from './report/ConflictNotice';
import { FindingsPreview } from './report/FindingsPreview';
import { enterMovesOn } from './report/keyboard';
import { NodulesEditor } from './report/NodulesEditor';
import { PatientFactors } from './report/PatientFactors';
import { SaveStatusLine, saveStatusText } from './report/SaveStatusLine';
import { ScannerValues } from './report/ScannerValues';
import { SectionCard, sectionSignature } from './report/SectionCard';
import { SubmittedNotice } from './report/SubmittedNotice';
import { useAutosave, type DraftSnapshot } from './report/useAutosave';
import { useSubmit } from './report/useSubmit';

interface Props {
  report: FormReport;
  context: FormContext;
  /** Derived code → section id (placement.ts), worked out on the server once per template. */
  placement: Readonly<Record<string, string>>;
  timeZone: string;
  /** 'correct': the reading physician corrects a preliminary report's measurements (saved as typed, no submitting). */
  mode?: 'record' | 'correct';
}

/**
 * The sonographer's structured measurement form, generated from the exam's template: every
 * value shown is the clinical engine's answer for what is typed, evaluated on each keystroke;
 * entries are saved on a pause in typing and the server recomputes what it stores.
 */
export default function ReportForm({ report, context, placement, timeZone, mode = 'record' }: Props) {
  const template = getTemplate(report.templateId)!;
  const [form, dispatch] = useReducer(formReducer, report, (r) => formFromStored(r, template));
  const patient = useMemo(() => ({ sex: context.patient.sex, birthDate: context.patient.birthDate, examDate: context.examDate }), [context]);
  const live = useMemo(() => evaluateLive(form, template, patient, context.prior ?? null, context.disabledUrgentRules), [form, template, patient, context.prior, context.disabledUrgentRules]);

  // The saver reads the newest entries when it sends, not those of the render that scheduled it.
  const liveRef = useRef(live);
  liveRef.current = live;
  const formRef = useRef(form);
  formRef.current = form;
  const cleanRef = useRef(form);
  const { status, saver } = useAutosave(report.id, report.version, (): DraftSnapshot => ({
    body: draftBody(liveRef.current.entries, formRef.current.probeId, formRef.current.sources),
    noduleKeys: liveRef.current.entries.noduleKeys,
  }));
  useEffect(() => {
    if (form !== cleanRef.current) saver.schedule();
  }, [form, saver]);

  // Refusals from the server: a 400 until the next successful save; a 422's "required" until the field is given.
  const [refused, setRefused] = useState<Record<string, string>>({});
  const [requiredKeys, setRequiredKeys] = useState<string[]>([]);
  useEffect(() => {
    if (status.phase === 'invalid') setRefused(toFormErrorKeys(status.fields, (status.sent as DraftSnapshot | null)?.noduleKeys ?? [], formRef.current));
    if (status.phase === 'saved') setRefused({});
  }, [status]);

  const missing = useMemo(() => missingRequired(template, live.entries.measurements), [template, live]);
  const errors = useMemo(() => {
    const stillMissing = requiredKeys.filter((k) => missing.includes(k.slice('measurements.'.length)));
    return { ...refused, ...Object.fromEntries(stillMissing.map((k) => [k, 'Required for the preliminary report.'])), ...live.errors };
  }, [refused, requiredKeys, missing, live]);

  const actions = useMemo<FieldActions>(() => {
    const max = template.nodules?.maxEntered ?? 0;
    return {
      value: (code, value) => dispatch({ type: 'value', code, value }),
      mark: (code, mark) => dispatch({ type: 'mark', code, mark }),
      patient: (field, value) => dispatch({ type: 'patient', field, value }),
      probe: (probeId) => dispatch({ type: 'probe', probeId }),
      addNodule: () => dispatch({ type: 'nodule-add', max }),
      removeNodule: (key) => dispatch({ type: 'nodule-remove', key }),
      restoreNodule: (index, nodule) => dispatch({ type: 'nodule-restore', index, nodule, max }),
      moveNodule: (key, by) => {
        dispatch({ type: 'nodule-move', key, by });
        // Reordering moves the card's DOM node, which drops focus: put it back on the button.
        requestAnimationFrame(() => {
          const same = document.getElementById(`move-${key}-${by}`) as HTMLButtonElement | null;
          (same && !same.disabled ? same : document.getElementById(`move-${key}-${-by}`))?.focus();
        });
      },
      noduleField: (key, field, value) => dispatch({ type: 'nodule-field', key, field, value }),
      noduleFocus: (key, focus, on) => dispatch({ type: 'nodule-focus', key, focus, on }),
    };
  }, [template]);

  // Values from outside the form: the scanner's structured report, and lengths measured with the
  // calipers in the image viewer (another island, which asks through a window event).
  const numberFields = useMemo(() => new Map(template.sections.flatMap((s) => s.fields.filter((f): f is NumberField => f.kind === 'number').map((f) => [f.code, f] as const))), [template]);
  const putExternal = useMemo(
    () => (code: string, value: number, source: MeasurementSource): string | null => {
      const field = numberFields.get(code);
      if (!field) return null;
      dispatch({ type: 'external', code, value: numberText(value, field.decimals), source });
      return `${field.label} set to ${formatQuantity(value, field.unit, field.decimals)}.`;
    },
    [numberFields],
  );
  useEffect(
    () =>
      listen<PutValueDetail>(PUT_VALUE_EVENT, ({ code, value, source }) => {
        const done = putExternal(code, value, source);
        answerValue({ code, ok: done !== null, message: done ?? 'That field is not on this form; nothing was put in.' });
      }),
    [putExternal],
  );

  const flags = useMemo(() => new Map<string, Flag>((live.result?.flags ?? []).map((f) => [f.valueCode, f])), [live]);
  const derivedBySection = useMemo(() => {
    const by = new Map<string, DerivedValue[]>();
    for (const d of live.result?.derived ?? []) {
      const at = placement[d.code] ?? template.sections[template.sections.length - 1]!.id;
      by.set(at, [...(by.get(at) ?? []), d]);
    }
    return by;
  }, [live, placement, template]);
  const assessments = useMemo(() => new Map<string, NoduleAssessment>((live.result?.assessments.nodules ?? []).map((a) => [a.id, a])), [live]);
  const required = useMemo(() => new Set(template.required.map((r) => r.code)), [template]);
  const waived = useMemo(() => waivedFields(template, form.values), [template, form.values]);

  const clock = useMemo(() => {
    const fmt = new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', second: '2-digit', hourCycle: 'h23' });
    return (d: Date) => fmt.format(d);
  }, [timeZone]);
  const labelOf = useMemo(() => fieldNames(template), [template]);
  const scanOrder = useMemo(() => template.sections.flatMap((s) => s.fields.map((f) => measurementKey(f.code))), [template]);

  const current = status.phase === 'conflict' ? status.current : null;
  const probeLabel = (id: number | null) => {
    const p = context.probes.find((x) => x.id === id);
    return p ? `${PROBE_KINDS[p.kind].label}, ${p.label}` : 'not recorded';
  };
  const diffs = useMemo(
    () => (current ? differences(template, { ...live.entries, probeId: form.probeId }, current, probeLabel) : []),
    [current, template, live, form.probeId], // eslint-disable-line react-hooks/exhaustive-deps
  );
  const [resolving, setResolving] = useState(false);
  const keepMine = async () => {
    if (!current) return;
    setResolving(true);
    await saver.keepMine(current.version);
    setResolving(false);
  };
  const loadTheirs = () => {
    if (!current) return;
    const theirs = formFromStored(current, template);
    cleanRef.current = theirs;
    dispatch({ type: 'replace', state: theirs });
    saver.adopt(current.version);
    setRefused({});
  };

  const { state: submit, submit: onSubmit } = useSubmit({ reportId: report.id, saver, scanOrder, onMissing: setRequiredKeys });
  const submitNow = () =>
    void onSubmit({
      firstError: scanOrder.find((k) => live.errors[k] !== undefined) ?? Object.keys(live.errors)[0],
      unfinishedNodule: form.nodules.find((n) => live.incompleteNodules.includes(n.key))?.id,
    });

  if (submit.phase === 'done') return <SubmittedNotice examId={context.examId} />;

  const unsavedCount = Object.keys(live.errors).length;
  const openedSavedAt = report.version > 0 ? new Date(report.updatedAt) : null;
  return (
    <div className="grid items-start gap-6 xl:grid-cols-[minmax(0,1fr)_23rem]">
      <form aria-label={`${template.title}: measurements`} noValidate className="min-w-0 space-y-4" onSubmit={(e) => e.preventDefault()} onKeyDown={enterMovesOn}>
        <PatientFactors
          patient={context.patient}
          probes={context.probes}
          defaultProbe={template.defaultProbe}
          heightCm={form.heightCm}
          weightKg={form.weightKg}
          probeId={form.probeId}
          errors={errors}
          bsa={live.result?.patient.bsa ?? null}
          derived={derivedBySection.get(PATIENT_SECTION) ?? []}
          flags={flags}
          actions={actions}
        />
        {template.sections.map((section) => {
          const props = { section, values: form.values, marks: form.marks, sources: form.sources, errors, flags, derived: derivedBySection.get(section.id) ?? [], required, waived, actions };
          return <SectionCard key={section.id} {...props} signature={sectionSignature(props)} />;
        })}
        {template.nodules && <NodulesEditor spec={template.nodules} nodules={form.nodules} assessments={assessments} errors={errors} actions={actions} />}
        {/* On narrow screens the status panel is below the form: keep the save state in sight (the live region above announces it). */}
        <div aria-hidden="true" className="sticky bottom-3 mx-auto w-fit rounded-full bg-ink-900/90 px-3 py-1 text-xs text-white shadow-lg xl:hidden">
          {saveStatusText({ status, openedSavedAt, unsavedCount, clock }).text}
        </div>
      </form>

      <aside aria-label="Saving and submitting" className="space-y-4 xl:sticky xl:top-4 xl:max-h-[calc(100vh-2rem)] xl:overflow-y-auto xl:pb-4">
        <section className="card space-y-3 p-4" aria-labelledby="submit-heading">
          <h2 id="submit-heading" className="sr-only">Saving and submitting</h2>
          <SaveStatusLine status={status} openedSavedAt={openedSavedAt} unsavedCount={unsavedCount} clock={clock} />
          {current !== null || status.phase === 'conflict' ? (
            <ConflictNotice who={current?.updatedBy ?? null} savedAt={current ? clock(new Date(current.updatedAt)) : null} differences={diffs} busy={resolving} onKeepMine={keepMine} onLoadTheirs={loadTheirs} />
          ) : null}
          {mode === 'correct' ? (
            <>
              <p className="text-sm text-ink-700">Corrections are saved as you type; the calculated values, flags and generated findings are worked out again. Your findings and impression are kept as you wrote them.</p>
              <a className="btn-primary block w-full text-center" href={`/exams/${context.examId}/report`}>Back to reading</a>
            </>
          ) : (
            <>
              <p className="text-sm text-ink-700">
                {missing.length === 0 ? 'All required measurements are in.' : `Still needed before submitting: ${missing.map((c) => labelOf.get(c) ?? c).join(', ')}.`}
              </p>
              <button type="button" className="btn-primary w-full" disabled={submit.phase === 'busy' || status.phase === 'conflict'} onClick={submitNow}>
                {submit.phase === 'busy' ? 'Submitting…' : 'Submit preliminary'}
              </button>
              {submit.phase === 'failed' && <p role="alert" className="rounded-md bg-high-50 px-3 py-2 text-sm text-high-800">{submit.message}</p>}
            </>
          )}
        </section>
        {mode === 'record' && <ScannerValues reportId={report.id} typed={form.values} onUse={(v) => putExternal(v.fieldCode, v.value, 'scanner')} />}
        {live.result && <Assessments result={live.result} />}
        <FindingsPreview findings={live.result?.findings ?? []} />
        <p className="text-xs leading-relaxed text-ink-500" data-testid="caution">{CAUTIONS}</p>
      </aside>
    </div>
  );
}
