import { useEffect, useRef } from 'react';

/** Shown in place of the form once the preliminary report is submitted. */
export function SubmittedNotice({ examId }: { examId: number }) {
  const heading = useRef<HTMLHeadingElement>(null);
  useEffect(() => heading.current?.focus(), []);
  return (
    <section role="status" className="card space-y-3 p-6" aria-labelledby="submitted-heading">
      <h2 id="submitted-heading" ref={heading} tabIndex={-1} className="text-lg font-semibold text-ink-900">
        Submitted: waiting for the reading physician
      </h2>
      <p className="text-sm text-ink-700">The preliminary report is in the reading queue and can no longer be changed here.</p>
      <div className="flex flex-wrap gap-3">
        <a className="btn-primary" href="/worklist">Back to the worklist</a>
        <a className="btn-quiet" href={`/exams/${examId}/report`}>View the submitted report</a>
      </div>
    </section>
  );
}
