// Units as a reader sees them on an axis or a table heading, from the mathjs unit strings the engine
// records ("T m", "m / s^2", "us", "kg m^2 / s^2"): products with a half-high dot, powers as
// superscripts, micro as µ, a quotient with a solidus (lib/calc/format.ts, unitText). A pure string
// parser, so it runs in the browser without a mathjs instance.
import { unitText } from './format';

interface UnitPart {
  name: string;
  power: number;
}

/** The factors of a mathjs unit string with their powers, or null when it is not one. */
export function parseUnitString(unit: string): UnitPart[] | null {
  const tokens = unit.match(/[A-Za-zµΩ°_][A-Za-z0-9µΩ°_]*|\^\s*\(?\s*[-+]?\d+(?:\.\d+)?\s*\)?|[*/()·]|\s+|./g);
  if (!tokens) return null;
  const parts: UnitPart[] = [];
  // The sign each open parenthesis applies, innermost last; `divide` applies to the next factor only.
  const groups: number[] = [1];
  let divide = false;
  let last: UnitPart | null = null;
  for (const token of tokens) {
    // "1 / s": the 1 only holds the place of a numerator.
    if (/^\s+$/.test(token) || token === '*' || token === '·' || token === '1') continue;
    if (token === '/') {
      if (divide) return null;
      divide = true;
      continue;
    }
    if (token === '(') {
      groups.push(groups[groups.length - 1] * (divide ? -1 : 1));
      divide = false;
      last = null;
      continue;
    }
    if (token === ')') {
      if (groups.length === 1) return null;
      groups.pop();
      last = null;
      continue;
    }
    if (token.startsWith('^')) {
      if (!last) return null;
      const power = Number(token.replace(/[\^()\s]/g, ''));
      if (!Number.isFinite(power)) return null;
      last.power *= power;
      continue;
    }
    if (/^[A-Za-zµΩ°_]/.test(token)) {
      const sign = groups[groups.length - 1] * (divide ? -1 : 1);
      last = { name: token, power: sign };
      parts.push(last);
      divide = false;
      continue;
    }
    return null;
  }
  if (divide || groups.length !== 1) return null;
  return parts;
}

/** "m / s^2" → "m/s²", "T m" → "T·m", "us" → "µs"; a string that is not a unit product is shown as given. */
export function unitLabel(unit: string | null | undefined): string {
  if (!unit) return '';
  const parts = parseUnitString(unit.trim());
  if (!parts || parts.length === 0) return unit;
  return unitText(parts);
}

/** "label (unit)", or the label alone for a plain number. */
export function axisLabel(label: string, unit: string | null | undefined): string {
  const u = unitLabel(unit);
  return u ? `${label} (${u})` : label;
}
