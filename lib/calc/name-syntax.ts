// The characters of a sheet name, shared by the engine (names.ts, unit-literals.ts) and the editor
// (components/sheet/editor-language.ts, editor-completions.ts), which must not load mathjs. Greek letters are letters:
// `γ`, `β`, `Δp`, `θ_1` (mathjs reads U+0370–U+03FF as letters).

/** Greek letters a name may hold: Α–Ω, α–ω and the variants ϑ, ϕ, ϵ. */
const GREEK_LETTERS = '\\u0391-\\u03A1\\u03A3-\\u03A9\\u03B1-\\u03C9\\u03D1\\u03D5\\u03F5';
/** A character that may start a name (a Latin or Greek letter). */
export const NAME_START = `A-Za-z${GREEK_LETTERS}`;
/** A character that may continue a name. */
export const NAME_CHAR = `A-Za-z0-9_${GREEK_LETTERS}`;
/** A whole sheet name. */
export const NAME = new RegExp(`^[${NAME_START}][${NAME_CHAR}]*$`);
