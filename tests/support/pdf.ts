import path from 'node:path';

/** Text of a PDF read back with pdfjs-dist (Mozilla's PDF reader), one string per page, whitespace collapsed. */
export async function pdfPages(buf: Buffer | Uint8Array): Promise<string[]> {
  const pdfjs = await import('pdfjs-dist/legacy/build/pdf.mjs');
  const standardFontDataUrl = `${path.join(process.cwd(), 'node_modules/pdfjs-dist/standard_fonts')}/`;
  const doc = await pdfjs.getDocument({
    data: new Uint8Array(buf),
    useSystemFonts: false,
    isEvalSupported: false,
    standardFontDataUrl,
  }).promise;
  const pages: string[] = [];
  for (let i = 1; i <= doc.numPages; i++) {
    const c = await (await doc.getPage(i)).getTextContent();
    const s = c.items.map((it) => ('str' in it ? it.str + (it.hasEOL ? ' ' : '') : '')).join('');
    pages.push(s.replace(/\s+/g, ' '));
  }
  await doc.destroy();
  return pages;
}

export async function pdfText(buf: Buffer | Uint8Array): Promise<string> {
  return (await pdfPages(buf)).join(' ');
}
