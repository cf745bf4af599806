// Bidirectional control characters (Unicode Standard Annex #9, "Explicit Directional Formatting";
// CVE-2021-42574, "Trojan Source"): embeddings, overrides and isolates, and the implicit marks.
// They are invisible and reorder the text around them, so a calculation's source can be made to read
// differently from what the engine evaluates (a comment that seems to end before the code, a
// statement that seems to say something else). A calculation cell's source is refused if it holds
// one; everywhere else text is shown, each is replaced by a visible marker (⟦U+202E⟧) instead of
// being allowed to act. Pure functions: the engine, the schemas, the pages and the PDF share them.

/** Each bidirectional control character, by code point, with its Unicode name. */
export const BIDI_CONTROLS: ReadonlyMap<number, string> = new Map([
  [0x061c, 'ARABIC LETTER MARK'],
  [0x200e, 'LEFT-TO-RIGHT MARK'],
  [0x200f, 'RIGHT-TO-LEFT MARK'],
  [0x202a, 'LEFT-TO-RIGHT EMBEDDING'],
  [0x202b, 'RIGHT-TO-LEFT EMBEDDING'],
  [0x202c, 'POP DIRECTIONAL FORMATTING'],
  [0x202d, 'LEFT-TO-RIGHT OVERRIDE'],
  [0x202e, 'RIGHT-TO-LEFT OVERRIDE'],
  [0x2066, 'LEFT-TO-RIGHT ISOLATE'],
  [0x2067, 'RIGHT-TO-LEFT ISOLATE'],
  [0x2068, 'FIRST STRONG ISOLATE'],
  [0x2069, 'POP DIRECTIONAL ISOLATE'],
]);

const CONTROL_CLASS = '\\u061c\\u200e\\u200f\\u202a-\\u202e\\u2066-\\u2069';
const HAS_CONTROL = new RegExp(`[${CONTROL_CLASS}]`);
const CODE_POINTS = '061C|200E|200F|202[A-E]|206[6-9]';

/** A fresh global pattern matching each bidirectional control character. */
export function bidiControlPattern(): RegExp {
  return new RegExp(`[${CONTROL_CLASS}]`, 'g');
}

/** "U+202E". */
function codePointLabel(codePoint: number): string {
  return `U+${codePoint.toString(16).toUpperCase().padStart(4, '0')}`;
}

/** "U+202E (RIGHT-TO-LEFT OVERRIDE)". */
export function describeBidiControl(codePoint: number): string {
  return `${codePointLabel(codePoint)} (${BIDI_CONTROLS.get(codePoint) ?? 'UNKNOWN'})`;
}

/** The visible stand-in for a control character: "⟦U+202E⟧". */
export function bidiMarker(codePoint: number): string {
  return `\u27e6${codePointLabel(codePoint)}\u27e7`;
}

export interface FoundBidiControl {
  codePoint: number;
  name: string;
  /** 1-based line of the text where the first one stands. */
  line: number;
}

/** The first bidirectional control character in `text`, with its line, or null. */
export function findBidiControl(text: string): FoundBidiControl | null {
  const m = HAS_CONTROL.exec(text);
  if (!m) return null;
  const codePoint = m[0].codePointAt(0)!;
  const line = text.slice(0, m.index).split('\n').length;
  return { codePoint, name: BIDI_CONTROLS.get(codePoint)!, line };
}

/** Why a calculation source holding `found` is refused (without the cell; without the line when `withLine` is false). */
export function bidiRefusalReason(found: FoundBidiControl, withLine = true): string {
  return `holds ${describeBidiControl(found.codePoint)}${withLine ? ` on line ${found.line}` : ''}, which can make the source read differently from what is evaluated`;
}

/**
 * The calculation cells (by 0-based index) whose source holds a bidirectional control character,
 * each with the message a refusal gives: "cell 3: holds U+202E (RIGHT-TO-LEFT OVERRIDE) on line 1, …".
 * Text cells are not refused: their text is shown with the characters made visible.
 */
export function bidiControlsInCalcCells(
  cells: ReadonlyArray<{ kind: string; source: string }>,
): Array<{ index: number; message: string }> {
  const out: Array<{ index: number; message: string }> = [];
  cells.forEach((cell, index) => {
    if (cell.kind !== 'calc' || typeof cell.source !== 'string') return;
    const found = findBidiControl(cell.source);
    if (found) out.push({ index, message: `cell ${index + 1}: ${bidiRefusalReason(found)}` });
  });
  return out;
}

/** `text` with every bidirectional control character replaced by its visible marker. */
export function revealBidiControls(text: string): string {
  if (!HAS_CONTROL.test(text)) return text;
  return text.replace(bidiControlPattern(), (c) => bidiMarker(c.codePointAt(0)!));
}

/** Every string inside `value` (arrays and plain objects, to any depth) with the characters revealed. */
export function revealBidiControlsDeep<T>(value: T): T {
  if (typeof value === 'string') return revealBidiControls(value) as T;
  if (Array.isArray(value)) return value.map((v) => revealBidiControlsDeep(v)) as T;
  if (value !== null && typeof value === 'object' && Object.getPrototypeOf(value) === Object.prototype) {
    return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, revealBidiControlsDeep(v)])) as T;
  }
  return value;
}

export type BidiSegment =
  { text: string; control: null } | { text: string; control: { codePoint: number; name: string } };

/**
 * `text` cut into plain runs and markers, for showing the markers in a style of their own: each
 * control character becomes a marker segment, and so does a marker already written out (text that
 * went through `revealBidiControls`, such as the issued PDF's data).
 */
export function bidiSegments(text: string): BidiSegment[] {
  const pattern = new RegExp(`[${CONTROL_CLASS}]|\\u27e6U\\+(${CODE_POINTS})\\u27e7`, 'g');
  const out: BidiSegment[] = [];
  let last = 0;
  for (const m of text.matchAll(pattern)) {
    if (m.index > last) out.push({ text: text.slice(last, m.index), control: null });
    const codePoint = m[1] ? parseInt(m[1], 16) : m[0].codePointAt(0)!;
    out.push({ text: bidiMarker(codePoint), control: { codePoint, name: BIDI_CONTROLS.get(codePoint)! } });
    last = m.index + m[0].length;
  }
  if (last < text.length || out.length === 0) out.push({ text: text.slice(last), control: null });
  return out;
}
