import localFont from 'next/font/local';

// The same files are embedded in issued PDFs (fonts/README.md).
export const textFont = localFont({
  src: [
    { path: '../fonts/source-sans-3/SourceSans3-Regular.ttf', weight: '400', style: 'normal' },
    { path: '../fonts/source-sans-3/SourceSans3-Italic.ttf', weight: '400', style: 'italic' },
    { path: '../fonts/source-sans-3/SourceSans3-SemiBold.ttf', weight: '600', style: 'normal' },
    { path: '../fonts/source-sans-3/SourceSans3-Bold.ttf', weight: '700', style: 'normal' },
  ],
  variable: '--font-text',
  display: 'swap',
});

export const monoFont = localFont({
  src: [
    { path: '../fonts/noto-sans-mono/NotoSansMono-Regular.ttf', weight: '400', style: 'normal' },
    { path: '../fonts/noto-sans-mono/NotoSansMono-Bold.ttf', weight: '700', style: 'normal' },
  ],
  variable: '--font-mono',
  display: 'swap',
});
