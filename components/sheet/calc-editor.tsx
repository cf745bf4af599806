'use client';

import { acceptCompletion, autocompletion, completionKeymap } from '@codemirror/autocomplete';
import { defaultKeymap, history, historyKeymap } from '@codemirror/commands';
import { bracketMatching, HighlightStyle, syntaxHighlighting } from '@codemirror/language';
import { Annotation, Compartment, EditorState } from '@codemirror/state';
import { drawSelection, EditorView, highlightSpecialChars, keymap, lineNumbers } from '@codemirror/view';
import { useEffect, useRef } from 'react';
import { calcCompletionSource, type NameAbove } from '@/lib/calc/editor-completions';
import { calcLanguage, TOKEN_STYLES, TOKEN_TAGS, type CalcTokenKind } from '@/lib/calc/editor-language';
import { tokens } from '@/tailwind.config';

export interface CalcEditorProps {
  value: string;
  onChange: (value: string) => void;
  /** The accessible name of the editor (e.g. "Calculation cell"). */
  label: string;
  /** Names defined in the cells above, offered by completion. */
  namesAbove?: readonly NameAbove[];
  readOnly?: boolean;
  /** id of an element that describes the editor (help text). */
  describedBy?: string;
  /** Height of the empty editor, in lines (it grows with its content). */
  minLines?: number;
  className?: string;
}

const highlightStyle = HighlightStyle.define(
  (Object.keys(TOKEN_TAGS) as CalcTokenKind[]).map((kind) => ({ tag: TOKEN_TAGS[kind], ...TOKEN_STYLES[kind] })),
);

const theme = EditorView.theme({
  '&': { backgroundColor: tokens.surface, color: tokens.ink, fontSize: '0.875rem' },
  // The focus ring is drawn around the whole editor by the wrapper (focus-within), as elsewhere.
  '&.cm-focused, .cm-content:focus-visible': { outline: 'none' },
  '.cm-scroller': { fontFamily: 'var(--font-mono), ui-monospace, monospace', lineHeight: '1.5rem' },
  '.cm-content': { padding: '0.5rem 0', caretColor: tokens.ink },
  '.cm-line': { padding: '0 0.75rem' },
  '.cm-gutters': { backgroundColor: tokens.paper, color: tokens['ink-muted'], borderRight: `1px solid ${tokens.rule}` },
  '.cm-lineNumbers .cm-gutterElement': { padding: '0 0.5rem 0 0.75rem', minWidth: '2.5rem' },
  '&.cm-focused .cm-selectionBackground, .cm-selectionBackground, ::selection': { backgroundColor: tokens['accent-soft'] },
  '&.cm-focused .cm-matchingBracket': { backgroundColor: tokens['accent-soft'], outline: `1px solid ${tokens.accent}` },
  '&.cm-focused .cm-nonmatchingBracket': { backgroundColor: tokens['fail-soft'], color: tokens.fail },
  '.cm-tooltip': { border: `1px solid ${tokens['rule-strong']}`, backgroundColor: tokens.surface, color: tokens.ink },
  '.cm-tooltip-autocomplete > ul': { fontFamily: 'var(--font-mono), ui-monospace, monospace', maxHeight: '14rem' },
  '.cm-tooltip-autocomplete > ul > li[aria-selected]': { backgroundColor: tokens.accent, color: tokens.surface },
  '.cm-completionDetail': { color: 'inherit', fontStyle: 'normal', marginLeft: '0.5rem' },
  '.cm-completionInfo': { maxWidth: '24rem', padding: '0.5rem 0.75rem', fontFamily: 'var(--font-text), system-ui, sans-serif' },
});

/** Marks changes that come from the `value` prop, so they are not echoed to onChange. */
const External = Annotation.define<boolean>();

/**
 * The editor of one calculation cell: CodeMirror 6 with the calculation language highlighted,
 * completion of names above, constants and library functions, line numbers, bracket matching,
 * undo/redo and the default keymap. Tab moves focus out (it accepts a completion while the list is
 * open; Escape then Tab always leaves).
 */
export function CalcEditor({ value, onChange, label, namesAbove = [], readOnly = false, describedBy, minLines = 3, className }: CalcEditorProps) {
  const host = useRef<HTMLDivElement>(null);
  const view = useRef<EditorView | null>(null);
  const onChangeRef = useRef(onChange);
  const namesRef = useRef(namesAbove);
  const compartments = useRef({ readOnly: new Compartment(), attributes: new Compartment() });
  onChangeRef.current = onChange;
  namesRef.current = namesAbove;

  const attributes = (): Record<string, string> => ({
    'aria-label': label,
    ...(describedBy ? { 'aria-describedby': describedBy } : {}),
    ...(readOnly ? { 'aria-readonly': 'true' } : {}),
    spellcheck: 'false',
    autocapitalize: 'off',
    autocorrect: 'off',
  });

  useEffect(() => {
    const { readOnly: ro, attributes: attrs } = compartments.current;
    const v = new EditorView({
      parent: host.current!,
      state: EditorState.create({
        doc: value,
        extensions: [
          lineNumbers(),
          highlightSpecialChars(),
          drawSelection(),
          history(),
          bracketMatching(),
          calcLanguage(),
          syntaxHighlighting(highlightStyle),
          autocompletion({ override: [calcCompletionSource(() => namesRef.current)], icons: false }),
          keymap.of([{ key: 'Tab', run: acceptCompletion }, ...completionKeymap, ...historyKeymap, ...defaultKeymap]),
          theme,
          // 1.5rem a line, plus the content's padding.
          EditorView.theme({ '.cm-content, .cm-gutter': { minHeight: `${minLines * 1.5 + 1}rem` } }),
          ro.of([EditorState.readOnly.of(readOnly)]),
          attrs.of(EditorView.contentAttributes.of(attributes())),
          EditorView.updateListener.of((update) => {
            if (update.docChanged && !update.transactions.some((t) => t.annotation(External))) {
              onChangeRef.current(update.state.doc.toString());
            }
          }),
        ],
      }),
    });
    view.current = v;
    return () => {
      v.destroy();
      view.current = null;
    };
    // The view is made once; the effects below keep it in step with the props.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, []);

  useEffect(() => {
    const v = view.current;
    if (!v) return;
    const current = v.state.doc.toString();
    if (current !== value) v.dispatch({ changes: { from: 0, to: current.length, insert: value }, annotations: External.of(true) });
  }, [value]);

  useEffect(() => {
    const v = view.current;
    if (!v) return;
    const { readOnly: ro, attributes: attrs } = compartments.current;
    v.dispatch({
      effects: [ro.reconfigure([EditorState.readOnly.of(readOnly)]), attrs.reconfigure(EditorView.contentAttributes.of(attributes()))],
    });
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [readOnly, label, describedBy]);

  return <div ref={host} className={`overflow-hidden rounded border border-rule-strong bg-surface focus-within:outline-3 focus-within:outline-offset-2 focus-within:outline-focus ${className ?? ''}`} />;
}
