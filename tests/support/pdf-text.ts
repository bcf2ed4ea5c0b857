import { getDocument } from 'pdfjs-dist/legacy/build/pdf.mjs';

/** Each page's text of a PDF (extracted with pdf.js), lines joined with spaces and runs of white space collapsed. */
export async function pdfPages(bytes: Buffer): Promise<string[]> {
  const pdf = await getDocument({ data: new Uint8Array(bytes), useSystemFonts: false, isEvalSupported: false }).promise;
  const pages: string[] = [];
  for (let n = 1; n <= pdf.numPages; n++) {
    const content = await (await pdf.getPage(n)).getTextContent();
    const text = content.items.map((item) => ('str' in item ? item.str + (item.hasEOL ? ' ' : '') : '')).join('');
    pages.push(text.replace(/\s+/g, ' '));
  }
  await pdf.destroy();
  return pages;
}
