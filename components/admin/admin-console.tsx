'use client';

import { formatUtc } from '@/components/ui/utc-time';
import { useEffect, useRef, useState } from 'react';
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

type UserActionKind = 'disable' | 'enable' | 'lock' | 'unlock' | 'send-password-reset';

/** What each action's opening button, reason field, submit button and notice say. */
const ACTION_WORDS: Record<
  UserActionKind,
  { open: (name: string) => string; reason: (name: string) => string; submit: string; done: (u: UserRow) => string }
> = {
  disable: {
    open: (name) => `Disable ${name}`,
    reason: (name) => `Reason to disable ${name}`,
    submit: 'Disable',
    done: (u) => `${u.name} is disabled.`,
  },
  enable: {
    open: (name) => `Enable ${name}`,
    reason: (name) => `Reason to enable ${name}`,
    submit: 'Enable',
    done: (u) => `${u.name} is enabled.`,
  },
  lock: {
    open: (name) => `Lock ${name}`,
    reason: (name) => `Reason to lock ${name}`,
    submit: 'Lock',
    done: (u) => `${u.name} is locked.`,
  },
  unlock: {
    open: (name) => `Unlock ${name}`,
    reason: (name) => `Reason to unlock ${name}`,
    submit: 'Unlock',
    done: (u) => `${u.name} is unlocked.`,
  },
  'send-password-reset': {
    open: (name) => `Send ${name} a reset link`,
    reason: (name) => `Reason to send ${name} a reset link`,
    submit: 'Send the link',
    done: (u) => `A password-reset link is on its way to ${u.email}.`,
  },
};

/**
 * One action on an account: a button that opens a form asking for the reason (focus moves to it),
 * which is sent, or cancelled (button or Escape) without effect, focus back on the button.
 */
function UserAction({
  user,
  action,
  onDone,
}: {
  user: UserRow;
  action: UserActionKind;
  onDone: (notice: string) => void;
}) {
  const [open, setOpen] = useState(false);
  const box = useRef<HTMLDivElement>(null);
  const opener = useRef<HTMLButtonElement>(null);
  const wasOpen = useRef(false);
  useEffect(() => {
    if (open) box.current?.querySelector<HTMLElement>('input, textarea')?.focus();
    else if (wasOpen.current) opener.current?.focus();
    wasOpen.current = open;
  }, [open]);
  const words = ACTION_WORDS[action];
  if (!open) {
    return (
      <button
        ref={opener}
        type="button"
        onClick={() => setOpen(true)}
        className="block text-left font-semibold text-accent underline"
      >
        {words.open(user.name)}
      </button>
    );
  }
  return (
    <div ref={box} className="min-w-56 rounded border border-rule p-3">
      <JsonForm
        action={`/api/admin/users/${user.id}`}
        method="PATCH"
        extra={{ action }}
        fields={[
          { name: 'reason', label: words.reason(user.name), required: true, hint: 'Recorded in the audit trail.' },
        ]}
        submitLabel={words.submit}
        onCancel={() => setOpen(false)}
        onDone={() => {
          wasOpen.current = false;
          setOpen(false);
          onDone(words.done(user));
        }}
      />
    </div>
  );
}

function AccountState({ user: u }: { user: UserRow }) {
  if (u.disabledAt) return 'disabled';
  if (u.lockedAt)
    return (
      <span className="text-fail">
        {u.lockedUntil ? `locked until ${formatUtc(u.lockedUntil)} (failed passwords)` : 'locked by an administrator'}
      </span>
    );
  return u.hasPassword ? 'active' : 'invited';
}

export function AdminConsole() {
  const users = useSWR('/api/admin/users', api.listUsers);
  const projects = useSWR('/api/projects', api.listProjects);
  const [projectId, setProjectId] = useState<string>('');
  // What the last action on an account did; focus moves here when its form closes.
  const [notice, setNotice] = useState('');
  const noticeRef = useRef<HTMLParagraphElement>(null);
  const accountChanged = (text: string) => {
    setNotice(text);
    void users.mutate();
    noticeRef.current?.focus();
  };
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
        <p ref={noticeRef} tabIndex={-1} role="status" className="text-sm text-pass">
          {notice}
        </p>
        <Table caption="Accounts">
          <thead>
            <tr className="border-b border-rule-strong text-left">
              <Th className="py-2 pr-3">Printed name</Th>
              <Th className="hidden py-2 pr-3 sm:table-cell">E-mail</Th>
              <Th className="hidden py-2 pr-3 sm:table-cell">State</Th>
              <Th className="py-2">Actions</Th>
            </tr>
          </thead>
          <tbody>
            {(users.data?.users ?? []).map((u) => (
              <tr key={u.id} className="border-b border-rule align-top">
                <Td className="py-2 pr-3">
                  {u.name}
                  {u.isAdmin ? <span className="ml-2 text-xs text-ink-muted">administrator</span> : null}
                  {/* On a phone the e-mail and the state stand under the name, and the actions beside it. */}
                  <span className="block break-all font-mono sm:hidden">{u.email}</span>
                  <span className="block sm:hidden">
                    <AccountState user={u} />
                  </span>
                </Td>
                <Td className="hidden py-2 pr-3 font-mono sm:table-cell">{u.email}</Td>
                <Td className="hidden py-2 pr-3 sm:table-cell">
                  <AccountState user={u} />
                </Td>
                <Td className="space-y-1 py-2">
                  {u.lockedAt ? <UserAction user={u} action="unlock" onDone={accountChanged} /> : null}
                  {!u.disabledAt && (!u.lockedAt || u.lockedUntil) ? (
                    <UserAction user={u} action="lock" onDone={accountChanged} />
                  ) : null}
                  {!u.disabledAt ? <UserAction user={u} action="send-password-reset" onDone={accountChanged} /> : null}
                  <UserAction
                    key={u.disabledAt ? 'enable' : 'disable'}
                    user={u}
                    action={u.disabledAt ? 'enable' : 'disable'}
                    onDone={accountChanged}
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
          {/* A select is as wide as its longest option: held to the page's width, so a long project
              name does not make a phone's page scroll sideways. */}
          <Field label="Project" id="admin-project" className="w-full min-w-0 max-w-xl">
            {(control) => (
              <select
                {...control}
                value={selected}
                onChange={(e) => setProjectId(e.target.value)}
                className="w-full min-w-0 rounded border border-rule-strong bg-surface px-3 py-2"
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
