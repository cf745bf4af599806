// A text cell's Markdown as plain blocks the PDF can draw: headings, paragraphs, list items,
// quotes, code, tables and math. Parsed by the app's own markdown-it instance (raw HTML off, the
// same `$…$`/`$$…$$` rules), so the PDF reads a cell exactly as the app does; images keep only their
// alternative text, links their text and address.
import { parseMarkdown } from '@/lib/sheets/markdown';

export type Inline =
  | { kind: 'text'; text: string; bold: boolean; italic: boolean; code: boolean }
  | { kind: 'math'; tex: string; display: boolean };

export type Block =
  | { kind: 'heading'; level: number; inlines: Inline[] }
  | { kind: 'paragraph'; inlines: Inline[]; indent: number; marker: string | null; quote: boolean }
  | { kind: 'code'; text: string; indent: number }
  | { kind: 'math'; tex: string; indent: number }
  | { kind: 'table'; header: Inline[][]; rows: Inline[][][] }
  | { kind: 'rule' };

type Token = ReturnType<typeof parseMarkdown>[number];

function inlinesOf(token: Token): Inline[] {
  const out: Inline[] = [];
  let bold = 0;
  let italic = 0;
  let href: string | null = null;
  let linkText = '';
  const text = (value: string, code = false) => {
    if (!value) return;
    if (href !== null) linkText += value;
    const last = out[out.length - 1];
    if (last && last.kind === 'text' && last.bold === bold > 0 && last.italic === italic > 0 && last.code === code)
      last.text += value;
    else out.push({ kind: 'text', text: value, bold: bold > 0, italic: italic > 0, code });
  };
  for (const child of token.children ?? []) {
    switch (child.type) {
      case 'text':
        text(child.content);
        break;
      case 'code_inline':
        text(child.content, true);
        break;
      case 'softbreak':
        text(' ');
        break;
      case 'hardbreak':
        text('\n');
        break;
      case 'strong_open':
        bold++;
        break;
      case 'strong_close':
        bold--;
        break;
      case 'em_open':
        italic++;
        break;
      case 'em_close':
        italic--;
        break;
      case 'link_open':
        href = String(child.attrGet('href') ?? '');
        linkText = '';
        break;
      case 'link_close': {
        const target = href;
        href = null;
        if (target && target !== linkText && target !== `mailto:${linkText}` && target !== `http://${linkText}`)
          text(` (${target})`);
        break;
      }
      case 'image':
        text(child.content);
        break;
      case 'math_inline':
        out.push({ kind: 'math', tex: child.content, display: false });
        break;
      case 'math_display_inline':
        out.push({ kind: 'math', tex: child.content, display: true });
        break;
      default:
        // s_open/s_close and anything else: the text inside is kept, the mark is not.
        if (child.content && !child.type.endsWith('_open') && !child.type.endsWith('_close')) text(child.content);
    }
  }
  return out;
}

/** Markdown source to blocks. */
export function markdownBlocks(source: string): Block[] {
  const tokens = parseMarkdown(source);
  const blocks: Block[] = [];
  const lists: Array<{ ordered: boolean; next: number }> = [];
  let quote = 0;
  let pendingMarker: string | null = null;
  let heading: number | null = null;
  let table: { header: Inline[][]; rows: Inline[][][]; inHead: boolean; row: Inline[][] | null } | null = null;

  for (const token of tokens) {
    switch (token.type) {
      case 'heading_open':
        heading = Number(token.tag.slice(1)) || 1;
        break;
      case 'heading_close':
        heading = null;
        break;
      case 'bullet_list_open':
        lists.push({ ordered: false, next: 1 });
        break;
      case 'ordered_list_open':
        lists.push({ ordered: true, next: Number(token.attrGet('start') ?? 1) || 1 });
        break;
      case 'bullet_list_close':
      case 'ordered_list_close':
        lists.pop();
        break;
      case 'list_item_open': {
        const list = lists[lists.length - 1];
        pendingMarker = list?.ordered ? `${list.next++}.` : '•';
        break;
      }
      case 'blockquote_open':
        quote++;
        break;
      case 'blockquote_close':
        quote--;
        break;
      case 'table_open':
        table = { header: [], rows: [], inHead: false, row: null };
        break;
      case 'thead_open':
        if (table) table.inHead = true;
        break;
      case 'thead_close':
        if (table) table.inHead = false;
        break;
      case 'tr_open':
        if (table) table.row = [];
        break;
      case 'tr_close':
        if (table?.row) {
          if (table.inHead) table.header = table.row;
          else table.rows.push(table.row);
          table.row = null;
        }
        break;
      case 'table_close':
        if (table) blocks.push({ kind: 'table', header: table.header, rows: table.rows });
        table = null;
        break;
      case 'inline': {
        const inlines = inlinesOf(token);
        if (table?.row) table.row.push(inlines);
        else if (heading !== null) blocks.push({ kind: 'heading', level: heading, inlines });
        else {
          blocks.push({
            kind: 'paragraph',
            inlines,
            indent: lists.length + quote,
            marker: pendingMarker,
            quote: quote > 0,
          });
          pendingMarker = null;
        }
        break;
      }
      case 'fence':
      case 'code_block':
        blocks.push({ kind: 'code', text: token.content.replace(/\n$/, ''), indent: lists.length + quote });
        pendingMarker = null;
        break;
      case 'math_block':
        blocks.push({ kind: 'math', tex: token.content, indent: lists.length + quote });
        pendingMarker = null;
        break;
      case 'hr':
        blocks.push({ kind: 'rule' });
        break;
      default:
        break;
    }
  }
  return blocks;
}
