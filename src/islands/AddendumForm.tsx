import { useState } from 'react';
import { api, ApiError } from '../lib/api-client';
import { RichTextField } from './reading/RichTextField';
import { SignerPassword } from './reading/SignerPassword';

export interface AddendumFormProps {
  reportId: number;
  version: number;
}

/**
 * A correction to a signed report: written here, signed with the password again, appended with
 * its time. The report becomes "amended" and the referrer is told again; what was signed before
 * stays as it was.
 */
export default function AddendumForm(p: AddendumFormProps) {
  const [open, setOpen] = useState(false);
  const [body, setBody] = useState('');
  const [password, setPassword] = useState('');
  const [fields, setFields] = useState<Record<string, string>>({});
  const [problem, setProblem] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  const sign = async (e: React.FormEvent) => {
    e.preventDefault();
    setBusy(true);
    setFields({});
    setProblem(null);
    try {
      await api(`/api/reports/${p.reportId}/addenda`, { method: 'POST', body: { version: p.version, bodyHtml: body, password } });
      window.location.reload();
    } catch (err) {
      setPassword('');
      if (err instanceof ApiError) {
        setFields(err.fields);
        setProblem(err.code === 'STALE' ? 'Another addendum was signed after you opened this report. Copy your text, reload the page and sign it again.' : Object.keys(err.fields).length ? null : err.message);
      } else setProblem('The addendum could not be signed.');
      setBusy(false);
    }
  };

  return (
    <section className="card space-y-4 p-5" aria-labelledby="addendum-heading">
      <div>
        <h2 id="addendum-heading" className="text-base font-semibold text-ink-900">Addendum</h2>
        <p className="mt-1 text-sm text-ink-600">A signed report is not edited. A correction or later information is written as an addendum, signed with your password, and sent to the referring clinician again.</p>
      </div>
      {!open ? (
        <button type="button" className="btn-quiet" onClick={() => setOpen(true)}>Write an addendum…</button>
      ) : (
        <form onSubmit={sign} className="space-y-4" aria-label="Write and sign an addendum">
          <RichTextField id="addendum-body" label="Addendum text" value={body} onChange={setBody} error={fields.bodyHtml ?? null} />
          <SignerPassword id="addendum-password" value={password} onChange={setPassword} error={fields.password} />
          {problem && <p role="alert" className="field-error">{problem}</p>}
          <div className="flex gap-2">
            <button type="submit" className="btn-primary" disabled={busy || password === ''}>{busy ? 'Signing…' : 'Sign addendum'}</button>
            <button type="button" className="btn-quiet" disabled={busy} onClick={() => { setOpen(false); setPassword(''); }}>Cancel</button>
          </div>
        </form>
      )}
    </section>
  );
}
