import katex from 'katex';

/**
 * TeX typeset by KaTeX. KaTeX escapes everything it is given and, with `trust: false`, refuses
 * commands that could carry links, classes or HTML, so its output is safe to insert.
 */
export function TexMath({ tex, display = false, className }: { tex: string; display?: boolean; className?: string }) {
  const html = katex.renderToString(tex, {
    displayMode: display,
    throwOnError: false,
    trust: false,
    strict: 'ignore',
    output: 'htmlAndMathml',
  });
  return <span className={className} dangerouslySetInnerHTML={{ __html: html }} />;
}
