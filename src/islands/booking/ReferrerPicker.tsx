import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { referrersQuery } from '../../lib/queries/referrers';
import type { ReferrerRow } from '../../lib/schemas/referrers';

/** Picks an active referring clinician, or none (self-referred). */
export function ReferrerPicker({ value, onChange }: { value: ReferrerRow | null; onChange: (r: ReferrerRow | null) => void }) {
  const [q, setQ] = useState('');
  const { data } = useQuery({ ...referrersQuery({ active: 'true', q, pageSize: 8 }), enabled: !value && q.trim().length >= 2 });
  if (value) {
    return (
      <div>
        <span className="field-label">Referring clinician</span>
        <div className="mt-1 flex items-center justify-between rounded-md border border-ink-200 bg-ink-50 px-3 py-2 text-sm">
          <span><b>{value.name}</b> · {value.practice}</span>
          <button type="button" className="text-xs font-semibold text-crest-700 hover:underline" onClick={() => onChange(null)}>Change</button>
        </div>
      </div>
    );
  }
  return (
    <div>
      <label htmlFor="referrer-search" className="field-label">Referring clinician <span className="font-normal text-ink-500">(leave empty if self-referred)</span></label>
      <input id="referrer-search" type="search" className="field-input" placeholder="Name or practice" value={q} onChange={(e) => setQ(e.target.value)} autoComplete="off" />
      {q.trim().length >= 2 && (
        <ul className="mt-1 max-h-48 overflow-auto rounded-md border border-ink-100 bg-white text-sm shadow-sm" aria-label="Matching referring clinicians">
          {data?.rows.length === 0 && <li className="px-3 py-2 text-ink-500">No active referring clinician matches.</li>}
          {data?.rows.map((r) => (
            <li key={r.id}><button type="button" className="w-full px-3 py-2 text-left hover:bg-crest-50" onClick={() => onChange(r)}><b>{r.name}</b> <span className="text-ink-500">· {r.practice}</span></button></li>
          ))}
        </ul>
      )}
    </div>
  );
}
