import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { api, ApiError } from '../../lib/api-client';
import { ROLES, ROLE_LABELS, type Role } from '../../lib/roles';
import type { UpdateUserInput, UserRow } from '../../lib/schemas/users';
import { Field } from './Field';
import type { ReferrerChoice } from './types';

interface Props {
  user: UserRow;
  referrers: ReferrerChoice[];
  isSelf: boolean;
  onDone: (message: string) => void;
  onClose: () => void;
}

/** The manager's actions on one account: role, access, unlock, new password. */
export function ManageUser({ user, referrers, isSelf, onDone, onClose }: Props) {
  const client = useQueryClient();
  const [role, setRole] = useState<Role>(user.role);
  const [referrerId, setReferrerId] = useState<number | null>(user.referrerId);
  const [password, setPassword] = useState('');
  const [problem, setProblem] = useState<{ message: string; fields: Record<string, string> } | null>(null);

  const change = useMutation({
    mutationFn: (body: Omit<UpdateUserInput, 'version'>) =>
      api<{ user: UserRow }>(`/api/users/${user.id}`, { method: 'PATCH', body: { ...body, version: user.version } }),
    onSuccess: () => void client.invalidateQueries({ queryKey: ['users'] }),
    onError: (error) =>
      setProblem(error instanceof ApiError ? { message: error.message, fields: error.fields } : { message: 'The change could not be saved.', fields: {} }),
  });
  const run = async (body: Omit<UpdateUserInput, 'version'>, message: string) => {
    setProblem(null);
    try {
      await change.mutateAsync(body);
      onDone(message);
    } catch {
      // shown through `problem`
    }
  };

  return (
    <section className="card space-y-5 p-5" aria-label={`Manage ${user.displayName}`}>
      <div className="flex items-start justify-between">
        <div>
          <h2 className="text-base font-semibold">{user.displayName}</h2>
          <p className="text-sm text-ink-500">{user.email}</p>
        </div>
        <button type="button" className="btn-quiet py-1" onClick={onClose}>Close</button>
      </div>
      {problem && <p role="alert" className="rounded-md bg-high-50 px-3 py-2 text-sm text-high-800">{problem.message}</p>}

      <div className="flex flex-wrap items-end gap-3">
        <Field id="manage-role" label="Role" error={problem?.fields.role}>
          <select id="manage-role" className="field-input" value={role} disabled={isSelf} onChange={(e) => setRole(e.target.value as Role)}>
            {ROLES.map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
          </select>
        </Field>
        {role === 'referrer' && (
          <Field id="manage-referrer" label="Directory entry" error={problem?.fields.referrerId}>
            <select id="manage-referrer" className="field-input" value={referrerId ?? ''} onChange={(e) => setReferrerId(e.target.value ? Number(e.target.value) : null)}>
              <option value="">Choose…</option>
              {referrers.map((r) => <option key={r.id} value={r.id}>{r.name} — {r.practice}</option>)}
            </select>
          </Field>
        )}
        <button type="button" className="btn-primary" disabled={isSelf || change.isPending || (role === user.role && referrerId === user.referrerId)}
          onClick={() => run({ role, ...(role === 'referrer' ? { referrerId } : {}) }, `${user.displayName} is now ${ROLE_LABELS[role]}.`)}>
          Save role
        </button>
      </div>
      {isSelf && <p className="text-xs text-ink-500">You cannot change your own role or deactivate your own account.</p>}

      <div className="flex flex-wrap gap-3">
        {user.active ? (
          <button type="button" className="btn-danger" disabled={isSelf || change.isPending} onClick={() => run({ active: false }, `${user.displayName} can no longer sign in.`)}>
            Deactivate account
          </button>
        ) : (
          <button type="button" className="btn-primary" disabled={change.isPending} onClick={() => run({ active: true }, `${user.displayName} can sign in again.`)}>
            Reactivate account
          </button>
        )}
        {user.locked && (
          <button type="button" className="btn-quiet" disabled={change.isPending} onClick={() => run({ unlock: true }, `${user.displayName} is unlocked.`)}>
            Unlock
          </button>
        )}
      </div>

      <form className="flex flex-wrap items-end gap-3" noValidate onSubmit={(e) => { e.preventDefault(); void run({ password }, `New password set for ${user.displayName}.`); }}>
        <Field id="manage-password" label="Set a new password" hint="At least 12 characters; also clears a lock." error={problem?.fields.password}>
          <input id="manage-password" type="password" autoComplete="new-password" className="field-input w-64" value={password} onChange={(e) => setPassword(e.target.value)} />
        </Field>
        <button type="submit" className="btn-quiet" disabled={change.isPending || password.length === 0}>Set password</button>
      </form>
    </section>
  );
}
