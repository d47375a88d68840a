import localFont from 'next/font/local';

// Shipped from npm packages; nothing is fetched at build time.
export const textFont = localFont({
  src: '../node_modules/@fontsource-variable/inter/files/inter-latin-wght-normal.woff2',
  variable: '--font-text',
  display: 'swap',
  weight: '100 900',
});

export const figuresFont = localFont({
  src: '../node_modules/@fontsource-variable/jetbrains-mono/files/jetbrains-mono-latin-wght-normal.woff2',
  variable: '--font-figures',
  display: 'swap',
  weight: '100 800',
});
