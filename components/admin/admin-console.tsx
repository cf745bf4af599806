'use client';

import { formatUtc } from '@/components/ui/utc-time';
import { useState } from 'react';
import useSWR from 'swr';
import { api } from '@/components/data/api-client';
import { JsonForm } from '@/components/forms/json-form';
import { Table, Td, Th } from '@/components/ui/table';
import { Field } from '@/components/ui/field';

type UserRow = Awaited<ReturnType<typeof api.listUsers>>['users'][number];

const ROLES = [
  { value: 'originator', label: 'Originator' },
  { value: 'checker', label: 'Checker' },
  { value: 'approver', label: 'Approver' },
  { value: 'controller', label: 'Document controller' },
  { value: 'viewer', label: 'Viewer' },
];

function UserAction({
  user,
  action,
  onDone,
}: {
  user: UserRow;
  action: 'disable' | 'enable' | 'lock' | 'unlock';
  onDone: () => void;
}) {
  const [open, setOpen] = useState(false);
  const label = { disable: 'Disable', enable: 'Enable', lock: 'Lock', unlock: 'Unlock' }[action];
  if (!open) {
    return (
      <button type="button" onClick={() => setOpen(true)} className="font-semibold text-accent underline">
        {label} {user.name}
      </button>
    );
  }
  return (
    <JsonForm
      action={`/api/admin/users/${user.id}`}
      method="PATCH"
      extra={{ action }}
      fields={[{ name: 'reason', label: `Reason to ${action} ${user.name}`, required: true }]}
      submitLabel={label}
      onDone={() => {
        setOpen(false);
        onDone();
      }}
    />
  );
}

export function AdminConsole() {
  const users = useSWR('/api/admin/users', api.listUsers);
  const projects = useSWR('/api/projects', api.listProjects);
  const [projectId, setProjectId] = useState<string>('');
  const selected = projectId || projects.data?.projects[0]?.id || '';
  const members = useSWR(selected ? `/api/projects/${selected}/members` : null, () => api.listMembers(selected));
  const userOptions = (users.data?.users ?? [])
    .filter((u) => !u.disabledAt)
    .map((u) => ({ value: u.id, label: `${u.name} (${u.email})` }));

  return (
    <div className="space-y-12">
      <section aria-labelledby="users-title" className="space-y-4">
        <h2 id="users-title" className="text-xl font-bold">
          People
        </h2>
        <Table caption="Accounts">
          <thead>
            <tr className="border-b border-rule-strong text-left">
              <Th className="py-2 pr-3">Printed name</Th>
              <Th className="py-2 pr-3">E-mail</Th>
              <Th className="py-2 pr-3">State</Th>
              <Th className="py-2">Actions</Th>
            </tr>
          </thead>
          <tbody>
            {(users.data?.users ?? []).map((u) => (
              <tr key={u.id} className="border-b border-rule align-top">
                <Td className="py-2 pr-3">
                  {u.name}
                  {u.isAdmin ? <span className="ml-2 text-xs text-ink-muted">administrator</span> : null}
                </Td>
                <Td className="py-2 pr-3 font-mono">{u.email}</Td>
                <Td className="py-2 pr-3">
                  {u.disabledAt ? (
                    'disabled'
                  ) : u.lockedAt ? (
                    <span className="text-fail">
                      {u.lockedUntil
                        ? `locked until ${formatUtc(u.lockedUntil)} (failed passwords)`
                        : 'locked by an administrator'}
                    </span>
                  ) : u.hasPassword ? (
                    'active'
                  ) : (
                    'invited'
                  )}
                </Td>
                <Td className="space-y-1 py-2">
                  {u.lockedAt ? <UserAction user={u} action="unlock" onDone={() => void users.mutate()} /> : null}
                  {!u.disabledAt && (!u.lockedAt || u.lockedUntil) ? (
                    <UserAction user={u} action="lock" onDone={() => void users.mutate()} />
                  ) : null}
                  <UserAction
                    user={u}
                    action={u.disabledAt ? 'enable' : 'disable'}
                    onDone={() => void users.mutate()}
                  />
                </Td>
              </tr>
            ))}
          </tbody>
        </Table>
        <div className="max-w-md rounded border border-rule bg-surface p-4">
          <h3 className="font-bold">Invite a person</h3>
          <p className="text-sm text-ink-muted">They receive an e-mail with a link to choose their password.</p>
          <div className="mt-3">
            <JsonForm
              action="/api/admin/users"
              fields={[
                { name: 'email', label: 'E-mail', type: 'email', required: true },
                { name: 'name', label: 'Printed name (as on signatures)', required: true },
                { name: 'isAdmin', label: 'Administrator', type: 'checkbox' },
              ]}
              submitLabel="Send the invitation"
              successMessage="Invitation sent."
              onDone={() => void users.mutate()}
            />
          </div>
        </div>
      </section>

      <section aria-labelledby="projects-title" className="space-y-4">
        <h2 id="projects-title" className="text-xl font-bold">
          Projects and roles
        </h2>
        <div className="flex flex-wrap items-end gap-3">
          <Field label="Project" id="admin-project">
            {(control) => (
              <select
                {...control}
                value={selected}
                onChange={(e) => setProjectId(e.target.value)}
                className="rounded border border-rule-strong bg-surface px-3 py-2"
              >
                {(projects.data?.projects ?? []).map((p) => (
                  <option key={p.id} value={p.id}>
                    {p.code}: {p.name}
                  </option>
                ))}
              </select>
            )}
          </Field>
        </div>
        {selected ? (
          <>
            <Table caption="Members and roles of the selected project">
              <thead>
                <tr className="border-b border-rule-strong text-left">
                  <Th className="py-2 pr-3">Member</Th>
                  <Th className="py-2">Roles</Th>
                </tr>
              </thead>
              <tbody>
                {(members.data?.members ?? []).map((m) => (
                  <tr key={m.userId} className="border-b border-rule">
                    <Td className="py-2 pr-3">
                      {m.name} <span className="font-mono text-xs text-ink-muted">{m.email}</span>
                    </Td>
                    <Td className="py-2">{m.roles.join(', ')}</Td>
                  </tr>
                ))}
              </tbody>
            </Table>
            <div className="grid gap-6 md:grid-cols-2">
              <div className="rounded border border-rule bg-surface p-4">
                <h3 className="font-bold">Give a role</h3>
                <JsonForm
                  action={`/api/projects/${selected}/members`}
                  fields={[
                    { name: 'userId', label: 'Person', type: 'select', options: userOptions, required: true },
                    { name: 'role', label: 'Role', type: 'select', options: ROLES, required: true },
                    { name: 'reason', label: 'Reason', required: true, hint: 'Recorded in the audit trail.' },
                  ]}
                  submitLabel="Give the role"
                  successMessage="Role given."
                  onDone={() => void members.mutate()}
                />
              </div>
              <div className="rounded border border-rule bg-surface p-4">
                <h3 className="font-bold">Take a role away</h3>
                <JsonForm
                  action={`/api/projects/${selected}/members`}
                  method="DELETE"
                  fields={[
                    { name: 'userId', label: 'Person', type: 'select', options: userOptions, required: true },
                    { name: 'role', label: 'Role', type: 'select', options: ROLES, required: true },
                    { name: 'reason', label: 'Reason', required: true, hint: 'Recorded in the audit trail.' },
                  ]}
                  submitLabel="Take the role away"
                  successMessage="Role taken away."
                  onDone={() => void members.mutate()}
                />
              </div>
            </div>
          </>
        ) : null}
        <div className="max-w-md rounded border border-rule bg-surface p-4">
          <h3 className="font-bold">Create a project</h3>
          <JsonForm
            action="/api/projects"
            fields={[
              { name: 'code', label: 'Code', required: true, hint: '2 to 10 capital letters or digits, e.g. TPT3.' },
              { name: 'name', label: 'Name', required: true },
              { name: 'legalOwner', label: 'Legal owner', required: true },
              {
                name: 'revisionScheme',
                label: 'Revision scheme',
                type: 'select',
                options: [
                  { value: 'letters', label: 'Letters A, B, C … (ASME Y14.35)' },
                  { value: 'numbers', label: 'Numbers 0, 1, 2 …' },
                ],
              },
            ]}
            submitLabel="Create the project"
            successMessage="Project created."
            onDone={() => void projects.mutate()}
          />
        </div>
      </section>
    </div>
  );
}
