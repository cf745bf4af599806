// The issued PDF as a tagged PDF (ISO 32000-1 §14.8): a structure tree (Document → headings,
// paragraphs, tables, formulas with their alternate text), marked content with MCIDs linking each
// element to what is drawn, page furniture marked as pagination artifacts, MarkInfo /Marked true.
//
// react-pdf 4.9 writes none of this (it draws through pdfkit, which can), and gives no hook between
// its layout and its drawing. So the document carries markers: zero-size Canvas elements placed
// before and after what they tag. react-pdf draws every node in document order, page by page, and
// calls a Canvas's paint function with a painter that forwards a fixed list of pdfkit methods; a
// marker passes its instruction through one of them (`miterLimit`), which this module wraps so that
// an instruction object is acted on with pdfkit's own marking API and any number is passed through.
// The same way in lets the formulas draw with pdfkit directly (`drawDirect`).
// Every instruction is a no-op for a pdfkit document that did not start tagged (see `install`).
//
// The rules the markers follow (checked here, an error stops the rendering):
// - a leaf (H1, P, TD, Formula …) holds drawn content; leaves never nest; content between leaves
//   (rules, cell frames, backgrounds) is an artifact;
// - a group (Sect, Table, TR, Div …) holds leaves and groups, and draws nothing of its own;
// - a leaf or group may run over a page break: the leaf's marked content is reopened on the next
//   page after its page furniture, under the same structure element;
// - page furniture (the running head and the title block) is a pagination artifact.
// package.json pins pdfkit at exactly the version @react-pdf/renderer depends on, so npm installs one
// copy: the one react-pdf draws with, whose prototype `install` patches.
import { Canvas } from '@react-pdf/renderer';
import PDFDocument from 'pdfkit';
import { Children, cloneElement, isValidElement, type ReactElement, type ReactNode } from 'react';

export type LeafType =
  | 'H1'
  | 'H2'
  | 'H3'
  | 'H4'
  | 'H5'
  | 'H6'
  | 'P'
  | 'Lbl'
  | 'TH'
  | 'TD'
  | 'Code'
  | 'Formula'
  | 'Figure'
  | 'Caption'
  | 'Note';
type GroupType = 'Sect' | 'Div' | 'Table' | 'TR' | 'L' | 'LI';

type Instruction =
  | { op: 'group'; type: GroupType }
  | { op: 'end-group' }
  | { op: 'leaf'; type: LeafType; alt?: string }
  | { op: 'end-leaf' }
  | { op: 'artifact' }
  | { op: 'end-artifact' };

const INSTRUCTION = Symbol.for('worldsheet.pdf-structure');
const INSTRUCTIONS = Symbol.for('worldsheet.pdf-structure-after');
const DIRECT = Symbol.for('worldsheet.pdf-direct');

/**
 * Lets a Canvas's paint function draw with the pdfkit document itself, through the same wrapped
 * method as the markers (the painter forwards only a fixed list of methods). `draw` runs at once,
 * with the page's current transform (the Canvas's top left corner, y down); an error is thrown
 * if it did not run, so nothing is ever left out silently.
 */
export function drawDirect(painter: unknown, draw: (doc: unknown) => void): void {
  let ran = false;
  (painter as { miterLimit(v: unknown): unknown }).miterLimit({
    [DIRECT]: (doc: unknown) => {
      ran = true;
      draw(doc);
    },
  });
  if (!ran) throw new Error('PDF drawing: the direct drawing hook is not installed (installPdfStructure).');
}

/**
 * Starts (or ends) a leaf from inside a Canvas's paint function, before (or after) what it draws:
 * for a Canvas that is itself the whole content of a leaf, in place of the two markers around it.
 * Same instruction, same rules, one layout node instead of three.
 */
export function openLeafInPaint(painter: unknown, as: LeafType, alt?: string): void {
  (painter as { miterLimit(v: unknown): unknown }).miterLimit({
    [INSTRUCTION]: { op: 'leaf', type: as, ...(alt ? { alt } : {}) } satisfies Instruction,
  });
}

/** Ends the leaf started by openLeafInPaint, after the last Canvas of its content has drawn. */
export function closeLeafInPaint(painter: unknown): void {
  (painter as { miterLimit(v: unknown): unknown }).miterLimit({
    [INSTRUCTION]: { op: 'end-leaf' } satisfies Instruction,
  });
}

// The slice of pdfkit's document (its MarkingsMixin) this module uses.
interface StructureContent {
  push(other: StructureContent): void;
}
interface StructureElement {
  add(child: StructureElement | StructureContent): StructureElement;
  end(): void;
}
interface Doc {
  markContent(tag: string, options?: Record<string, unknown> | null): Doc;
  markStructureContent(tag: string, options?: Record<string, unknown>): StructureContent;
  endMarkedContent(): Doc;
  struct(type: string, options?: Record<string, unknown>, children?: StructureContent[]): StructureElement;
  addStructure(element: StructureElement): Doc;
  addContent(data: string): Doc;
  miterLimit(value: unknown): Doc;
  addPage(options?: unknown): Doc;
  initMarkings(options: Record<string, unknown>): void;
  transform(...args: unknown[]): Doc;
  addNamedDestination(name: unknown, ...args: unknown[]): Doc;
}

interface State {
  groups: StructureElement[];
  /** The leaf in progress; its content is null until something of it is drawn. */
  leaf: { type: LeafType; alt?: string; content: StructureContent | null } | null;
  /** What the current page has open: the leaf's marked content, a pagination artifact, or the artifact between leaves. */
  open: 'leaf' | 'pagination' | 'artifact' | null;
  /** Nothing is open and the next drawing must first open the leaf in progress, else an artifact. */
  pending: boolean;
  /** Set while this module writes a marking operator, which is not a drawing. */
  writing: boolean;
}

const states = new WeakMap<Doc, State>();
let actedOn = 0;

// Operators that only set the graphics state (ISO 32000-1 Table 51, 57, 74) and the marking
// operators themselves: writing one of them draws nothing, so it does not open a marked sequence.
// Every other operator (BT, a path's first m or re, Do, sh …) starts something drawn.
const STATE_OPERATORS = new Set([
  'q',
  'Q',
  'cm',
  'w',
  'J',
  'j',
  'M',
  'd',
  'ri',
  'i',
  'gs',
  'CS',
  'cs',
  'SC',
  'SCN',
  'sc',
  'scn',
  'G',
  'g',
  'RG',
  'rg',
  'K',
  'k',
  'BDC',
  'BMC',
  'EMC',
  'MP',
  'DP',
]);

const SPACE = /\s/;

/** Whether content ending with `data`'s last operator draws; read from the end (a formula's data is long). */
function draws(data: string): boolean {
  let end = data.length;
  while (end > 0 && SPACE.test(data[end - 1])) end--;
  let start = end;
  while (start > 0 && !SPACE.test(data[start - 1])) start--;
  return !STATE_OPERATORS.has(data.slice(start, end));
}

function write(doc: Doc, st: State, fn: () => void): void {
  st.writing = true;
  try {
    fn();
  } finally {
    st.writing = false;
  }
}

function closeOpen(doc: Doc, st: State): void {
  if (st.open) write(doc, st, () => doc.endMarkedContent());
  st.open = null;
  st.pending = false;
}

/** Opens, just before something is drawn, the leaf in progress (its content continues here), else an artifact. */
function openPending(doc: Doc, st: State): void {
  st.pending = false;
  write(doc, st, () => {
    const leaf = st.leaf;
    if (leaf) {
      const content = doc.markStructureContent(leaf.type);
      if (leaf.content) leaf.content.push(content);
      else leaf.content = content;
      st.open = 'leaf';
    } else {
      doc.markContent('Artifact');
      st.open = 'artifact';
    }
  });
}

function act(doc: Doc, st: State, ins: Instruction): void {
  actedOn += 1;
  switch (ins.op) {
    case 'group': {
      if (st.leaf) throw new Error(`PDF structure: a ${ins.type} cannot start inside a ${st.leaf.type}.`);
      const element = doc.struct(ins.type);
      st.groups[st.groups.length - 1].add(element);
      st.groups.push(element);
      return;
    }
    case 'end-group': {
      if (st.groups.length < 2) throw new Error('PDF structure: a group ends that was not started.');
      st.groups.pop()!.end();
      return;
    }
    case 'leaf': {
      if (st.leaf) throw new Error(`PDF structure: a ${ins.type} cannot start inside a ${st.leaf.type}.`);
      closeOpen(doc, st);
      st.leaf = { type: ins.type, alt: ins.alt, content: null };
      st.pending = true;
      return;
    }
    case 'end-leaf': {
      const leaf = st.leaf;
      if (!leaf) throw new Error('PDF structure: a leaf ends that was not started.');
      if (st.open === 'leaf') closeOpen(doc, st);
      st.leaf = null;
      // The element is made once its content is complete, so every page it ran over is in the
      // parent tree; a leaf that drew nothing is no element.
      if (leaf.content)
        st.groups[st.groups.length - 1].add(doc.struct(leaf.type, leaf.alt ? { alt: leaf.alt } : {}, [leaf.content]));
      if (!st.open) st.pending = true;
      return;
    }
    case 'artifact': {
      closeOpen(doc, st);
      write(doc, st, () => doc.markContent('Artifact', { type: 'Pagination' }));
      st.open = 'pagination';
      return;
    }
    case 'end-artifact': {
      if (st.open !== 'pagination') throw new Error('PDF structure: an artifact ends that was not started.');
      closeOpen(doc, st);
      st.pending = true;
      return;
    }
  }
}

let installed = false;

/**
 * Makes every pdfkit document of this process start tagged (the issued PDF is the only one drawn
 * with react-pdf) and teaches it the markers' instructions. Idempotent.
 */
export function installPdfStructure(): void {
  if (installed) return;
  installed = true;
  const proto = (PDFDocument as unknown as { prototype: Doc }).prototype;
  const initMarkings = proto.initMarkings;
  proto.initMarkings = function (this: Doc, options: Record<string, unknown>) {
    initMarkings.call(this, { ...options, tagged: true });
    const root = this.struct('Document');
    this.addStructure(root);
    states.set(this, { groups: [root], leaf: null, open: null, pending: false, writing: false });
  };
  const addContent = proto.addContent;
  proto.addContent = function (this: Doc, data: string) {
    const st = states.get(this);
    if (st && st.pending && !st.writing && draws(data)) openPending(this, st);
    return addContent.call(this, data);
  };
  const addPage = proto.addPage;
  proto.addPage = function (this: Doc, options?: unknown) {
    addPage.call(this, options);
    // The previous page's open marked content was closed when it was written (pdfkit's endPageMarkings);
    // what is drawn next on this page continues the leaf in progress, else is an artifact.
    const st = states.get(this);
    if (st) {
      st.open = null;
      st.pending = true;
    }
    return this;
  };
  const miterLimit = proto.miterLimit;
  proto.miterLimit = function (this: Doc, value: unknown) {
    if (value && typeof value === 'object' && DIRECT in value) {
      (value as { [DIRECT]: (doc: unknown) => void })[DIRECT](this);
      return this;
    }
    const instructions = carried(value, INSTRUCTION);
    if (instructions) return actOn(this, instructions);
    return miterLimit.call(this, value);
  };
  // A whole element's instructions (see `onElements`): before it draws, as a transform operation
  // react-pdf applies to the element (a "matrix" whose only value is the instruction); after it
  // and its children have drawn, as the element's named destination.
  const transform = proto.transform;
  proto.transform = function (this: Doc, ...args: unknown[]) {
    const instructions = carried(args[0], INSTRUCTION);
    if (instructions) return actOn(this, instructions);
    return transform.apply(this, args);
  };
  const addNamedDestination = proto.addNamedDestination;
  proto.addNamedDestination = function (this: Doc, name: unknown, ...args: unknown[]) {
    const instructions = carried(name, INSTRUCTIONS);
    if (instructions) return actOn(this, instructions);
    return addNamedDestination.call(this, name, ...args);
  };
}

/** The instructions a value passed to one of pdfkit's methods carries under `key` (one or a list), or null. */
function carried(value: unknown, key: typeof INSTRUCTION | typeof INSTRUCTIONS): readonly Instruction[] | null {
  if (!value || typeof value !== 'object' || !(key in value)) return null;
  const held = (value as Record<symbol, Instruction | Instruction[]>)[key];
  return Array.isArray(held) ? held : [held];
}

/** Acts on carried instructions in order; the method that carried them does nothing else. */
function actOn(doc: Doc, instructions: readonly Instruction[]): Doc {
  const st = states.get(doc);
  if (st) for (const ins of instructions) act(doc, st, ins);
  return doc;
}

/** How many structure instructions this process has acted on: a rendering that adds none was drawn untagged. */
export function structureInstructionsActedOn(): number {
  return actedOn;
}

// In the normal flow a marker is 0.001 pt tall (layout is not rounded: react-pdf sets Yoga's point scale factor to 0); inside a row it is taken out of the flow so that it
// cannot move its siblings (`absolute`), which is safe only where the row is never split by a page.
function Marker({ instruction, absolute = false }: { instruction: Instruction; absolute?: boolean }): ReactElement {
  return (
    <Canvas
      style={
        absolute
          ? { position: 'absolute', left: 0, top: 0, width: 0.01, height: 0.01 }
          : { width: 0.001, height: 0.001 }
      }
      paint={(painter) => {
        (painter as unknown as { miterLimit(v: unknown): unknown }).miterLimit({ [INSTRUCTION]: instruction });
        return null;
      }}
    />
  );
}

/**
 * `children` (react-pdf Views or Texts side by side, none split by a page) carrying `before` and
 * `after` themselves, instead of markers around them: react-pdf applies an element's `transform`
 * operations before drawing it and adds its `id` as a named destination after drawing it and its
 * children, and `installPdfStructure` teaches pdfkit to act on an instruction passed either way.
 * The first element carries `before`, the last `after`; no layout node is added (a 200-cell
 * sheet's statements had some 5,000 markers). An element split over a page would act on them on
 * each page, so `whole` is only for elements that are not split (inside a `wrap={false}` box, in
 * a row, or fixed page furniture).
 */
function onElements(children: ReactNode, before: Instruction[], after: Instruction[]): ReactElement {
  const elements = Children.toArray(children);
  if (elements.length === 0) throw new Error('PDF structure: a whole leaf or group has no element to carry its tags.');
  for (const element of elements) {
    if (!isValidElement(element) || typeof element.type !== 'string')
      throw new Error('PDF structure: a whole leaf or group is made of react-pdf elements (Views or Texts).');
  }
  const carry = (element: ReactElement, tags: Record<string, unknown>) => {
    const props = element.props as { transform?: unknown; id?: unknown; style?: unknown };
    const styles = ([] as unknown[]).concat(props.style ?? []) as Array<Record<string, unknown> | null | undefined>;
    if (props.transform !== undefined || props.id !== undefined || styles.some((st) => st && 'transform' in st))
      throw new Error('PDF structure: an element carrying tags cannot have a transform or an id of its own.');
    return cloneElement(element as ReactElement<Record<string, unknown>>, tags);
  };
  const transform = before.map((ins) => ({ operation: 'matrix', value: [{ [INSTRUCTION]: ins }] }));
  const id = { [INSTRUCTIONS]: after };
  const list = elements as ReactElement[];
  if (list.length === 1) return carry(list[0], { transform, id });
  return (
    <>
      {carry(list[0], { transform })}
      {list.slice(1, -1)}
      {carry(list[list.length - 1], { id })}
    </>
  );
}

/**
 * Tags what `children` draw as one structure element of a leaf type (a heading, a paragraph, a table cell, a formula…).
 * With `whole`, `children` are Views or Texts that a page never splits, and carry the tags themselves (`onElements`).
 */
export function Leaf({
  as,
  alt,
  inRow = false,
  whole = false,
  children,
}: {
  as: LeafType;
  alt?: string;
  inRow?: boolean;
  whole?: boolean;
  children: ReactNode;
}): ReactElement {
  if (whole) return onElements(children, [{ op: 'leaf', type: as, ...(alt ? { alt } : {}) }], [{ op: 'end-leaf' }]);
  return (
    <>
      <Marker instruction={{ op: 'leaf', type: as, ...(alt ? { alt } : {}) }} absolute={inRow} />
      {children}
      <Marker instruction={{ op: 'end-leaf' }} absolute={inRow} />
    </>
  );
}

/** Groups the leaves and groups `children` hold under one structure element (a section, a table, a row…). */
export function Group({
  as,
  inRow = false,
  whole = false,
  children,
}: {
  as: GroupType;
  inRow?: boolean;
  /** `children` are Views or Texts that a page never splits, and carry the tags themselves (`onElements`). */
  whole?: boolean;
  children: ReactNode;
}): ReactElement {
  if (whole) return onElements(children, [{ op: 'group', type: as }], [{ op: 'end-group' }]);
  return (
    <>
      <Marker instruction={{ op: 'group', type: as }} absolute={inRow} />
      {children}
      <Marker instruction={{ op: 'end-group' }} absolute={inRow} />
    </>
  );
}

/**
 * Page furniture, repeated on every page (running head, title block): a pagination artifact. With
 * `whole`, `children` are Views or Texts that carry the tags themselves (`onElements`).
 */
export function PageArtifact({ whole = false, children }: { whole?: boolean; children: ReactNode }): ReactElement {
  if (whole) return onElements(children, [{ op: 'artifact' }], [{ op: 'end-artifact' }]);
  return (
    <>
      <Marker instruction={{ op: 'artifact' }} absolute />
      {children}
      <Marker instruction={{ op: 'end-artifact' }} absolute />
    </>
  );
}
