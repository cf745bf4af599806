// An administrator sends an account a password-reset link (changeUser, action send-password-reset): the
// link goes to the account's own address, says who sent it, sets a password once, and the audit event
// carries the reason; the same rules as the holder's own request (three in 15 minutes, none for a
// disabled account), and one sent to oneself is audited alike.
import { describe, expect, it } from 'vitest';
import { confirmPasswordReset } from '../../lib/auth/account';
import { authenticatePassword } from '../../lib/auth/sign-in';
import { changeUser } from '../../lib/projects/users';
import { testDb } from '../support/database';
import { drainMailQueue, listMail, waitForMail } from '../support/mailbox';
import { makeUser } from '../support/people';
import { refusal } from '../support/refusal';

const send = (reason: string) => ({ action: 'send-password-reset' as const, reason });

describe('a reset link sent by an administrator', () => {
  it('reaches the holder only, names the administrator, works once, and is audited with its reason', async () => {
    const admin = await makeUser(testDb(), 'admin@example.test', { admin: true });
    const ada = await makeUser(testDb(), 'ada@example.test');
    await changeUser(testDb(), admin, ada.userId, send('Forgot it on the night shift'));
    await drainMailQueue();
    const mail = await waitForMail({ to: 'ada@example.test', kind: 'password-reset' });
    expect(mail.subject).toBe('Reset your Worldsheet password');
    expect(mail.text).toContain('Person admin, an administrator of Worldsheet, sent you this link.');
    expect((await listMail()).filter((m) => m.to.includes('admin@example.test'))).toEqual([]);
    const token = new URL(mail.links.find((l) => l.includes('/reset-password?token='))!).searchParams.get('token')!;

    await confirmPasswordReset(testDb(), { token, newPassword: 'a password Ada chose' });
    const signedIn = await authenticatePassword(testDb(), {
      email: 'ada@example.test',
      password: 'a password Ada chose',
      ip: '192.0.2.1',
    });
    expect(signedIn.email).toBe('ada@example.test');
    expect((await refusal(confirmPasswordReset(testDb(), { token, newPassword: 'and another one here' }))).code).toBe(
      'bad_request',
    );

    const events = await testDb()
      .selectFrom('audit_events')
      .select(['action', 'actor_id', 'object_id', 'reason', 'new_value'])
      .where('action', 'in', ['user.send-password-reset', 'user.password-reset'])
      .orderBy('id')
      .execute();
    expect(events).toEqual([
      {
        action: 'user.send-password-reset',
        actor_id: admin.userId,
        object_id: ada.userId,
        reason: 'Forgot it on the night shift',
        new_value: { mailedTo: 'ada@example.test' },
      },
      expect.objectContaining({ action: 'user.password-reset', actor_id: null, object_id: ada.userId }),
    ]);
  });

  it('is audited when an administrator sends one to their own account', async () => {
    const admin = await makeUser(testDb(), 'admin@example.test', { admin: true });
    await changeUser(testDb(), admin, admin.userId, send('Rotating my own password'));
    const event = await testDb()
      .selectFrom('audit_events')
      .select(['actor_id', 'object_id', 'reason'])
      .where('action', '=', 'user.send-password-reset')
      .executeTakeFirstOrThrow();
    expect(event).toEqual({ actor_id: admin.userId, object_id: admin.userId, reason: 'Rotating my own password' });
  });

  it('is refused for a disabled account and after three in 15 minutes, and then nothing is mailed or audited', async () => {
    const admin = await makeUser(testDb(), 'admin@example.test', { admin: true });
    const ada = await makeUser(testDb(), 'ada@example.test');
    for (const n of [1, 2, 3]) await changeUser(testDb(), admin, ada.userId, send(`attempt ${n}`));
    const fourth = await refusal(changeUser(testDb(), admin, ada.userId, send('attempt 4')));
    expect(fourth.code).toBe('too_many_requests');

    const bob = await makeUser(testDb(), 'bob@example.test');
    await changeUser(testDb(), admin, bob.userId, { action: 'disable', reason: 'left the company' });
    expect((await refusal(changeUser(testDb(), admin, bob.userId, send('one more')))).code).toBe('conflict');

    const sent = await testDb()
      .selectFrom('audit_events')
      .select('reason')
      .where('action', '=', 'user.send-password-reset')
      .orderBy('id')
      .execute();
    expect(sent.map((e) => e.reason)).toEqual(['attempt 1', 'attempt 2', 'attempt 3']);
    const tokens = await testDb()
      .selectFrom('email_tokens')
      .select('user_id')
      .where('purpose', '=', 'password-reset')
      .execute();
    expect(tokens.map((t) => t.user_id)).toEqual([ada.userId, ada.userId, ada.userId]);
  });
});
