import { renderMarkdown } from '@/lib/sheets/markdown';

/**
 * A text cell: Markdown with `$…$` and `$$…$$` math, rendered by renderMarkdown (markdown-it without
 * raw HTML, KaTeX with `trust: false`, then sanitize-html), so the HTML is safe to insert. Works in
 * server and client components alike.
 */
export function MarkdownView({ source, className }: { source: string; className?: string }) {
  const html = renderMarkdown(source);
  return (
    <div
      className={`ws-markdown max-w-prose space-y-3 text-ink [&_a]:text-accent [&_a]:underline [&_blockquote]:border-l-4 [&_blockquote]:border-rule [&_blockquote]:pl-3 [&_blockquote]:text-ink-muted [&_code]:font-mono [&_code]:text-sm [&_h1]:text-2xl [&_h1]:font-bold [&_h2]:text-xl [&_h2]:font-bold [&_h3]:text-lg [&_h3]:font-semibold [&_h4]:font-semibold [&_ol]:list-decimal [&_ol]:pl-6 [&_pre]:overflow-x-auto [&_pre]:rounded [&_pre]:bg-paper [&_pre]:p-3 [&_table]:border-collapse [&_td]:border [&_td]:border-rule [&_td]:px-2 [&_th]:border [&_th]:border-rule [&_th]:px-2 [&_ul]:list-disc [&_ul]:pl-6 ${className ?? ''}`}
      dangerouslySetInnerHTML={{ __html: html }}
    />
  );
}
