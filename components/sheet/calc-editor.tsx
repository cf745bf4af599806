'use client';

import { acceptCompletion, autocompletion, completionKeymap } from '@codemirror/autocomplete';
import { defaultKeymap, history, historyKeymap } from '@codemirror/commands';
import { bracketMatching, HighlightStyle, syntaxHighlighting } from '@codemirror/language';
import { Annotation, Compartment, EditorState, RangeSet, StateEffect, StateField } from '@codemirror/state';
import {
  Decoration,
  drawSelection,
  EditorView,
  gutter,
  GutterMarker,
  highlightSpecialChars,
  keymap,
  lineNumbers,
  ViewPlugin,
} from '@codemirror/view';
import { useEffect, useRef } from 'react';
import { calcCompletionSource, type NameAbove } from './editor-completions';
import { calcLanguage, TOKEN_STYLES, TOKEN_TAGS, type CalcTokenKind } from './editor-language';
import { tokens } from '@/tailwind.config';

export interface CalcEditorProps {
  value: string;
  onChange: (value: string) => void;
  /** The accessible name of the editor (e.g. "Calculation cell"). */
  label: string;
  /** Names defined in the cells above, offered by completion. */
  namesAbove?: readonly NameAbove[];
  readOnly?: boolean;
  /** The statements' errors by line (1-based, as in StatementResult.line): a marker in the gutter. */
  lineErrors?: ReadonlyArray<LineError>;
  /** id of an element that describes the editor (help text). */
  describedBy?: string;
  /** Height of the empty editor, in lines (it grows with its content). */
  minLines?: number;
  className?: string;
}

interface LineError {
  line: number;
  message: string;
}

// Errors in the gutter: a marker on each line whose statement has an error. The marker is a button
// (in the tab order, before the text) whose accessible name is "Line N error: message"; activating
// it puts the cursor on that line. The line itself gets a faint background.
const setLineErrors = StateEffect.define<readonly LineError[]>();
const lineErrorsField = StateField.define<readonly LineError[]>({
  create: () => [],
  update: (value, tr) => tr.effects.reduce((v, e) => (e.is(setLineErrors) ? e.value : v), value),
});

class ErrorMarker extends GutterMarker {
  constructor(
    readonly line: number,
    readonly message: string,
  ) {
    super();
  }
  eq(other: GutterMarker): boolean {
    return other instanceof ErrorMarker && other.line === this.line && other.message === this.message;
  }
  toDOM(view: EditorView): Node {
    const button = document.createElement('button');
    button.type = 'button';
    button.className = 'cm-calc-error-marker';
    button.textContent = '!';
    if (!this.message) {
      button.style.visibility = 'hidden';
      button.tabIndex = -1;
      button.setAttribute('aria-hidden', 'true');
      return button;
    }
    // The names a message sets in backquotes are read as words (the results below show them in code face).
    const words = this.message.replace(/`/g, '');
    button.setAttribute('aria-label', `Line ${this.line} error: ${words}`);
    button.title = words;
    const line = this.line;
    button.addEventListener('mousedown', (e) => e.preventDefault());
    button.addEventListener('click', () => {
      const doc = view.state.doc;
      view.dispatch({ selection: { anchor: doc.line(Math.min(line, doc.lines)).from }, scrollIntoView: true });
      view.focus();
    });
    return button;
  }
}

function errorMarkers(state: EditorState): RangeSet<GutterMarker> {
  const doc = state.doc;
  const errors = [...state.field(lineErrorsField)]
    .filter((e) => e.line >= 1 && e.line <= doc.lines)
    .sort((a, b) => a.line - b.line);
  const seen = new Set<number>();
  return RangeSet.of(
    errors
      .filter((e) => !seen.has(e.line) && seen.add(e.line))
      .map((e) => new ErrorMarker(e.line, e.message).range(doc.line(e.line).from)),
  );
}

// CodeMirror hides the whole gutter area from assistive technology (aria-hidden on .cm-gutters),
// which would hide the markers too (and a focusable element must not sit in a hidden subtree): the
// area is exposed and every other gutter (the line numbers) hidden instead.
const gutterAccessibility = ViewPlugin.fromClass(
  class {
    constructor(readonly view: EditorView) {
      this.apply();
    }
    update() {
      this.apply();
    }
    apply() {
      for (const area of this.view.dom.querySelectorAll('.cm-gutters'))
        if (area.getAttribute('aria-hidden') === 'true') area.removeAttribute('aria-hidden');
      for (const g of this.view.dom.querySelectorAll('.cm-gutter:not(.cm-calc-error-gutter)'))
        if (!g.hasAttribute('aria-hidden')) g.setAttribute('aria-hidden', 'true');
    }
  },
);

const errorLine = Decoration.line({ class: 'cm-calc-error-line' });
const lineErrorExtensions = [
  lineErrorsField,
  gutterAccessibility,
  gutter({
    class: 'cm-calc-error-gutter',
    markers: (view) => errorMarkers(view.state),
    initialSpacer: () => new ErrorMarker(1, ''),
  }),
  EditorView.decorations.compute([lineErrorsField, 'doc'], (state) => {
    const markers = errorMarkers(state);
    const lines: ReturnType<typeof errorLine.range>[] = [];
    for (let it = markers.iter(); it.value; it.next()) lines.push(errorLine.range(it.from));
    return Decoration.set(lines);
  }),
];

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
  '.cm-calc-error-gutter .cm-gutterElement': { padding: '0 0.25rem' },
  '.cm-calc-error-marker': {
    width: '1.125rem',
    height: '1.125rem',
    marginTop: '0.1875rem',
    borderRadius: '9999px',
    border: 'none',
    backgroundColor: tokens.fail,
    color: tokens.surface,
    fontWeight: '700',
    fontSize: '0.75rem',
    lineHeight: '1.125rem',
    padding: '0',
    cursor: 'pointer',
  },
  '.cm-calc-error-marker:focus-visible': { outline: `3px solid ${tokens.focus}`, outlineOffset: '1px' },
  '.cm-calc-error-line': { backgroundColor: tokens['fail-soft'] },
  '&.cm-focused .cm-selectionBackground, .cm-selectionBackground, ::selection': {
    backgroundColor: tokens['accent-soft'],
  },
  '&.cm-focused .cm-matchingBracket': { backgroundColor: tokens['accent-soft'], outline: `1px solid ${tokens.accent}` },
  '&.cm-focused .cm-nonmatchingBracket': { backgroundColor: tokens['fail-soft'], color: tokens.fail },
  '.cm-tooltip': { border: `1px solid ${tokens['rule-strong']}`, backgroundColor: tokens.surface, color: tokens.ink },
  '.cm-tooltip-autocomplete > ul': { fontFamily: 'var(--font-mono), ui-monospace, monospace', maxHeight: '14rem' },
  '.cm-tooltip-autocomplete > ul > li[aria-selected]': { backgroundColor: tokens.accent, color: tokens.surface },
  '.cm-completionDetail': { color: 'inherit', fontStyle: 'normal', marginLeft: '0.5rem' },
  '.cm-completionInfo': {
    maxWidth: '24rem',
    padding: '0.5rem 0.75rem',
    fontFamily: 'var(--font-text), system-ui, sans-serif',
  },
});

/** Marks changes that come from the `value` prop, so they are not echoed to onChange. */
const External = Annotation.define<boolean>();

/**
 * The editor of one calculation cell: CodeMirror 6 with the calculation language highlighted,
 * completion of names above, constants and library functions, line numbers, bracket matching,
 * undo/redo and the default keymap. Tab moves focus out (it accepts a completion while the list is
 * open; Escape then Tab always leaves).
 */
export function CalcEditor({
  value,
  onChange,
  label,
  namesAbove = [],
  lineErrors,
  readOnly = false,
  describedBy,
  minLines = 3,
  className,
}: CalcEditorProps) {
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
          lineErrorExtensions,
          highlightSpecialChars(),
          drawSelection(),
          history(),
          bracketMatching(),
          calcLanguage(),
          syntaxHighlighting(highlightStyle),
          autocompletion({ override: [calcCompletionSource(() => namesRef.current)], icons: false }),
          keymap.of([{ key: 'Tab', run: acceptCompletion }, ...completionKeymap, ...historyKeymap, ...defaultKeymap]),
          theme,
          // Long lines wrap: nothing of a statement is hidden past the box's edge (on a phone above all),
          // and the box has no sideways scroll that only a pointer could reach.
          EditorView.lineWrapping,
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
    if (current !== value)
      v.dispatch({ changes: { from: 0, to: current.length, insert: value }, annotations: External.of(true) });
  }, [value]);

  // The markers follow the latest results; a key of their content avoids dispatching on every render.
  const errorsKey = JSON.stringify(lineErrors ?? []);
  useEffect(() => {
    view.current?.dispatch({ effects: setLineErrors.of(JSON.parse(errorsKey) as LineError[]) });
  }, [errorsKey]);

  useEffect(() => {
    const v = view.current;
    if (!v) return;
    const { readOnly: ro, attributes: attrs } = compartments.current;
    v.dispatch({
      effects: [
        ro.reconfigure([EditorState.readOnly.of(readOnly)]),
        attrs.reconfigure(EditorView.contentAttributes.of(attributes())),
      ],
    });
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [readOnly, label, describedBy]);

  return (
    <div
      ref={host}
      className={`overflow-hidden rounded border border-rule-strong bg-surface focus-within:outline-3 focus-within:outline-offset-2 focus-within:outline-focus ${className ?? ''}`}
    />
  );
}
