import localFont from 'next/font/local';

// The browser gets WOFF2 (about a quarter of the TTF's bytes), preloaded by next/font; issued PDFs
// embed the TTF files these were compressed from (fonts/README.md).
export const textFont = localFont({
  src: [
    { path: '../fonts/source-sans-3/SourceSans3-Regular.woff2', weight: '400', style: 'normal' },
    { path: '../fonts/source-sans-3/SourceSans3-Italic.woff2', weight: '400', style: 'italic' },
    { path: '../fonts/source-sans-3/SourceSans3-SemiBold.woff2', weight: '600', style: 'normal' },
    { path: '../fonts/source-sans-3/SourceSans3-Bold.woff2', weight: '700', style: 'normal' },
  ],
  variable: '--font-text',
  display: 'swap',
  preload: true,
});

export const monoFont = localFont({
  src: [
    { path: '../fonts/noto-sans-mono/NotoSansMono-Regular.woff2', weight: '400', style: 'normal' },
    { path: '../fonts/noto-sans-mono/NotoSansMono-Bold.woff2', weight: '700', style: 'normal' },
  ],
  variable: '--font-mono',
  display: 'swap',
  preload: true,
});
