// @vitest-environment jsdom
// The labelled field (components/ui/field.tsx): the label names its control, the hint and the error are
// joined to it with aria-describedby, and an error is announced and marks the control invalid (WCAG 2.2:
// 1.3.1, 3.3.1, 3.3.2, 4.1.3). Also the generic JSON form, whose fields are built with it.
import { createElement as h } from 'react';
import { renderToStaticMarkup } from 'react-dom/server';
import { describe, expect, it } from 'vitest';
import { JsonForm } from '../../components/forms/json-form';
import { describedBy, Field, inputClass } from '../../components/ui/field';

const parse = (html: string) => new DOMParser().parseFromString(html, 'text/html');

describe('Field', () => {
  it('binds the label to the control by id and describes nothing when there is no hint or error', () => {
    const doc = parse(
      renderToStaticMarkup(
        h(Field, {
          label: 'E-mail',
          id: 'sign-in-email',
          children: (c) => h('input', { ...c, className: inputClass }),
        }),
      ),
    );
    const label = doc.querySelector('label')!;
    const input = doc.querySelector('input')!;
    expect(label.textContent).toBe('E-mail');
    expect(label.className).toBe('block text-sm font-semibold');
    expect(label.htmlFor).toBe('sign-in-email');
    expect(input.id).toBe('sign-in-email');
    expect(input.hasAttribute('aria-describedby')).toBe(false);
    expect(input.hasAttribute('aria-invalid')).toBe(false);
    expect(doc.querySelector('[role="alert"]')).toBeNull();
  });

  it('gives the control a fresh id when none is given, still bound to the label', () => {
    const doc = parse(renderToStaticMarkup(h(Field, { label: 'Comment', children: (c) => h('textarea', c) })));
    const id = doc.querySelector('textarea')!.id;
    expect(id).not.toBe('');
    expect(doc.querySelector('label')!.htmlFor).toBe(id);
  });

  it('joins the hint, the error and other descriptions to the control, announces the error and marks the control invalid', () => {
    const doc = parse(
      renderToStaticMarkup(
        h(Field, {
          label: 'Tolerance',
          id: 'tol',
          hint: 'Write 1e-6, 0.1 % or 5 ppm.',
          error: 'Not a number.',
          describedBy: 'carried',
          children: (c) => h('input', c),
        }),
      ),
    );
    const input = doc.querySelector('input')!;
    expect(input.getAttribute('aria-describedby')).toBe('tol-hint tol-error carried');
    expect(input.getAttribute('aria-invalid')).toBe('true');
    expect(doc.getElementById('tol-hint')!.textContent).toBe('Write 1e-6, 0.1 % or 5 ppm.');
    const error = doc.getElementById('tol-error')!;
    expect(error.textContent).toBe('Not a number.');
    expect(error.getAttribute('role')).toBe('alert');
  });

  it('takes other classes for the label and the hint, keeping the ids that bind them', () => {
    const doc = parse(
      renderToStaticMarkup(
        h(Field, {
          label: 'Units shown',
          id: 'units',
          hint: 'How results are shown.',
          labelClassName: 'block text-sm',
          hintClassName: 'text-sm text-ink-muted',
          children: (c) => h('select', c),
        }),
      ),
    );
    expect(doc.querySelector('label')!.className).toBe('block text-sm');
    expect(doc.getElementById('units-hint')!.className).toBe('text-sm text-ink-muted');
    expect(doc.querySelector('select')!.getAttribute('aria-describedby')).toBe('units-hint');
  });

  it('describedBy leaves out what is absent and gives undefined for nothing', () => {
    expect(describedBy('a', undefined, false, null, 'b')).toBe('a b');
    expect(describedBy(undefined, false)).toBeUndefined();
  });
});

describe('JsonForm', () => {
  it('labels every field, joins each hint to its control and keeps a checkbox before its label', () => {
    const doc = parse(
      renderToStaticMarkup(
        h(JsonForm, {
          action: '/api/example',
          submitLabel: 'Save',
          fields: [
            { name: 'email', label: 'E-mail', type: 'email', hint: 'Where the mail goes.' },
            {
              name: 'role',
              label: 'Role',
              type: 'select',
              options: [{ value: 'viewer', label: 'Viewer' }],
            },
            { name: 'admin', label: 'Administrator', type: 'checkbox', hint: 'Can manage accounts.' },
          ],
        }),
      ),
    );
    for (const control of doc.querySelectorAll('input, select')) {
      const label = doc.querySelector(`label[for="${control.id}"]`);
      expect(label, control.getAttribute('name')!).not.toBeNull();
    }
    const email = doc.querySelector('input[name="email"]')!;
    expect(email.className).toBe(inputClass);
    expect(doc.getElementById(email.getAttribute('aria-describedby')!)!.textContent).toBe('Where the mail goes.');
    expect(doc.querySelector('select[name="role"]')!.hasAttribute('aria-describedby')).toBe(false);
    const admin = doc.querySelector('input[name="admin"]')!;
    expect(admin.nextElementSibling!.tagName).toBe('LABEL');
    expect(doc.getElementById(admin.getAttribute('aria-describedby')!)!.textContent).toBe('Can manage accounts.');
  });
});
