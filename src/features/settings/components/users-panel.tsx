import { useState, type FormEvent } from 'react';
import { ROLES, ROLE_LABELS, type Role } from '@shared/schemas/enums';
import { useCreateUser, useUpdateUser, useUsers } from '../api/users';
import { Field } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { ErrorNote } from '@/components/ui/error-note';

export function UsersPanel() {
  const { data, error } = useUsers();
  const create = useCreateUser();
  const update = useUpdateUser();
  const [form, setForm] = useState({ email: '', name: '', role: 'technician' as Role, password: '' });

  function submit(e: FormEvent) {
    e.preventDefault();
    create.mutate(form, { onSuccess: () => setForm({ email: '', name: '', role: 'technician', password: '' }) });
  }

  return (
    <div className="grid gap-6 md:grid-cols-[1fr_20rem]">
      <div>
        {error && <ErrorNote error={error} />}
        {update.error && <ErrorNote error={update.error} />}
        <table className="data w-full rounded-md border border-rule bg-panel text-left text-sm">
          <thead>
            <tr className="border-b border-rule">
              <th className="p-2">Name</th>
              <th className="p-2">E-mail</th>
              <th className="p-2">Role</th>
              <th className="p-2">Active</th>
            </tr>
          </thead>
          <tbody>
            {data?.users.map((u) => (
              <tr key={u.id} className="border-b border-rule/60">
                <td className="p-2">{u.name}</td>
                <td className="p-2">{u.email}</td>
                <td className="p-2">
                  <select
                    aria-label={`Role of ${u.name}`}
                    className="min-h-11 rounded-md border border-rule bg-panel px-2"
                    value={u.role}
                    onChange={(e) => update.mutate({ id: u.id, role: e.target.value as Role })}
                  >
                    {ROLES.map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
                  </select>
                </td>
                <td className="p-2">
                  <input type="checkbox" className="h-5 w-5" aria-label={`${u.name} active`} checked={u.active} onChange={(e) => update.mutate({ id: u.id, active: e.target.checked })} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <form onSubmit={submit} className="flex flex-col gap-3 rounded-md border border-rule bg-panel p-4" aria-label="Add a user">
        <h2 className="font-semibold">Add a user</h2>
        <Field label="Name"><input required value={form.name} onChange={(e) => setForm({ ...form, name: e.target.value })} /></Field>
        <Field label="E-mail"><input type="email" required value={form.email} onChange={(e) => setForm({ ...form, email: e.target.value })} /></Field>
        <Field label="Role">
          <select value={form.role} onChange={(e) => setForm({ ...form, role: e.target.value as Role })}>
            {ROLES.map((r) => <option key={r} value={r}>{ROLE_LABELS[r]}</option>)}
          </select>
        </Field>
        <Field label="First password" hint="At least 10 characters; ask them to change it.">
          <input type="password" autoComplete="new-password" required value={form.password} onChange={(e) => setForm({ ...form, password: e.target.value })} />
        </Field>
        {create.error && <ErrorNote error={create.error} />}
        <Button type="submit" disabled={create.isPending}>Add user</Button>
      </form>
    </div>
  );
}
