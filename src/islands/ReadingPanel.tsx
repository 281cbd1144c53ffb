import { useEffect, useRef, useState } from 'react';
import { api, ApiError } from '../lib/api-client';
import type { ReportDto } from '../lib/schemas/reports';
import { formatInstant } from '../lib/time';
import { RichTextField } from './reading/RichTextField';
import { SignerPassword } from './reading/SignerPassword';

export interface ReadingPanelProps {
  reportId: number;
  version: number;
  /** The physician's text so far, or the generated findings as a start. */
  findingsHtml: string;
  impressionHtml: string;
  me: number;
  timeZone: string;
}

type Claim = ReportDto['claimedBy'];

/**
 * The reading physician's work on a preliminary report: the claim (who is reading it), the
 * findings and impression in the rich-text editor, saving, and signing with the password asked
 * again. The server sanitizes and decides; this only keeps what was typed until it is stored.
 */
export default function ReadingPanel(p: ReadingPanelProps) {
  const [version, setVersion] = useState(p.version);
  const [findings, setFindings] = useState(p.findingsHtml);
  const [impression, setImpression] = useState(p.impressionHtml);
  const [dirty, setDirty] = useState(false);
  const [claim, setClaim] = useState<{ by: Claim; at: string | null } | null>(null);
  const [status, setStatus] = useState<string | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [fields, setFields] = useState<Record<string, string>>({});
  const [stale, setStale] = useState<ReportDto | null>(null);
  const [signing, setSigning] = useState(false);
  const [password, setPassword] = useState('');
  const [busy, setBusy] = useState(false);
  const passwordRef = useRef<HTMLInputElement>(null);

  const claimIt = async (takeOver: boolean) => {
    try {
      const { report } = await api<{ report: ReportDto }>(`/api/reports/${p.reportId}/claim`, { method: 'POST', body: { takeOver } });
      setClaim({ by: report.claimedBy, at: report.claimedAt });
    } catch (e) {
      setProblem(e instanceof ApiError ? e.message : 'The report could not be claimed.');
    }
  };
  useEffect(() => {
    void claimIt(false);
  }, []);
  useEffect(() => {
    if (signing) passwordRef.current?.focus();
  }, [signing]);

  const failed = (e: unknown, what: string) => {
    if (e instanceof ApiError) {
      setFields(e.fields);
      if (e.code === 'STALE' && e.details.current) setStale(e.details.current as ReportDto);
      setProblem(e.code === 'STALE' ? 'Someone else saved this report after you opened it. Your text is kept below; load theirs or save yours over it.' : e.message);
    } else setProblem(`${what} did not work.`);
  };

  /** Saves the text; answers the version to sign (unchanged when nothing was typed). */
  const save = async (overVersion = version): Promise<number | null> => {
    setBusy(true);
    setProblem(null);
    setFields({});
    try {
      const { report } = await api<{ report: ReportDto }>(`/api/reports/${p.reportId}/reading`, { method: 'PUT', body: { version: overVersion, findingsHtml: findings, impressionHtml: impression } });
      setVersion(report.version);
      setDirty(false);
      setStale(null);
      setStatus(`Saved ${formatInstant(new Date(report.updatedAt), p.timeZone)}`);
      if (report.claimedBy) setClaim({ by: report.claimedBy, at: report.claimedAt });
      return report.version;
    } catch (e) {
      failed(e, 'Saving');
      return null;
    } finally {
      setBusy(false);
    }
  };

  const sign = async (e: React.FormEvent) => {
    e.preventDefault();
    const v = dirty ? await save() : version;
    if (v === null) return;
    setBusy(true);
    setProblem(null);
    setFields({});
    try {
      await api(`/api/reports/${p.reportId}/sign`, { method: 'POST', body: { version: v, password } });
      setPassword('');
      window.location.reload();
    } catch (err) {
      failed(err, 'Signing');
      setBusy(false);
    }
  };

  const someoneElse = claim?.by && claim.by.id !== p.me;
  return (
    <section className="card space-y-5 p-5" aria-labelledby="reading-heading">
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <h2 id="reading-heading" className="text-base font-semibold text-ink-900">Reading</h2>
        <p className="text-sm text-ink-600" data-testid="claim-status">
          {claim === null
            ? 'Claiming…'
            : someoneElse
              ? `${claim.by!.name} has been reading this report since ${formatInstant(new Date(claim.at!), p.timeZone)}.`
              : 'You are reading this report.'}
        </p>
      </div>
      {someoneElse && (
        <p className="rounded-md bg-dune-50 px-3 py-2 text-sm text-dune-700 ring-1 ring-dune-300">
          Edits by two physicians at once are refused, not merged.{' '}
          <button type="button" className="btn-quiet ml-1" onClick={() => void claimIt(true)}>Take over reading</button>
        </p>
      )}

      <RichTextField
        id="reading-findings"
        label="Findings"
        value={findings}
        onChange={(html) => {
          setFindings(html);
          setDirty(true);
        }}
        error={fields.findingsHtml ?? null}
        describedBy="reading-findings-hint"
      />
      <p id="reading-findings-hint" className="-mt-3 text-xs text-ink-500">Starts from the sentences generated from the measurements; edit freely. Headings, lists and bold only.</p>
      <RichTextField
        id="reading-impression"
        label="Impression"
        value={impression}
        onChange={(html) => {
          setImpression(html);
          setDirty(true);
        }}
        error={fields.impressionHtml ?? null}
      />

      {problem && <p role="alert" className="field-error">{problem}</p>}
      {stale && (
        <div className="flex flex-wrap gap-2">
          <button type="button" className="btn-primary" disabled={busy} onClick={() => void save(stale.version)}>Save mine over it</button>
          <button
            type="button"
            className="btn-quiet"
            disabled={busy}
            onClick={() => {
              setFindings(stale.findingsHtml ?? '');
              setImpression(stale.impressionHtml ?? '');
              setVersion(stale.version);
              setDirty(false);
              setStale(null);
              setProblem(null);
            }}
          >
            Load the saved version
          </button>
        </div>
      )}

      <div className="flex flex-wrap items-center gap-3 border-t border-ink-100 pt-4">
        <button type="button" className="btn-quiet" disabled={busy || !dirty} onClick={() => void save()}>Save</button>
        <span className="text-sm text-ink-600" role="status" data-testid="reading-status">{dirty ? 'Not saved yet' : (status ?? '')}</span>
        <span className="flex-1" />
        {!signing && (
          <button type="button" className="btn-primary" disabled={busy} onClick={() => setSigning(true)}>Sign report…</button>
        )}
      </div>
      {signing && (
        <form className="space-y-3 rounded-md bg-ink-50 p-4 ring-1 ring-ink-100" aria-label="Sign the report" onSubmit={sign}>
          <p className="text-sm text-ink-700">Signing makes this report final: it can no longer be edited, only corrected by an addendum. Enter your password to sign as yourself.</p>
          <SignerPassword id="sign-password" value={password} onChange={setPassword} error={fields.password} inputRef={passwordRef} />
          <div className="flex gap-2">
            <button type="submit" className="btn-primary" disabled={busy || password === ''}>{busy ? 'Signing…' : 'Sign'}</button>
            <button type="button" className="btn-quiet" disabled={busy} onClick={() => { setSigning(false); setPassword(''); }}>Cancel</button>
          </div>
        </form>
      )}
    </section>
  );
}
